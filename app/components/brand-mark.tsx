// Bendwise's mark: a strip resting on two supports, bowed by a load arrow at midspan.
// With an empty title it is decoration beside the written name, hidden from screen readers.
export function BrandMark({ size = 36, title = "Bendwise" }: { size?: number; title?: string }) {
  return (
    <svg
      width={size}
      height={size}
      viewBox="0 0 48 48"
      {...(title ? { role: "img", "aria-label": title } : { "aria-hidden": true })}
    >
      <rect x="1" y="1" width="46" height="46" rx="11" fill="#0d5c57" />
      <path d="M7 27 Q24 39 41 27" stroke="#fbf8f1" strokeWidth="4.5" fill="none" strokeLinecap="round" />
      <path d="M5 33 l4 -6 l4 6 z M35 33 l4 -6 l4 6 z" fill="#d9d2c3" />
      <path d="M24 8 v16" stroke="#f3a37c" strokeWidth="3.5" strokeLinecap="round" />
      <path d="M18.5 19.5 L24 26 L29.5 19.5" stroke="#f3a37c" strokeWidth="3.5" fill="none" strokeLinecap="round" strokeLinejoin="round" />
    </svg>
  );
}
