// Whether a box's content is wider than the box (it scrolls sideways), kept up to date as either
// changes size: a wide table on a phone then says that it slides (the lesson's exercise tables, the
// readings table).
import { useEffect, useRef, useState } from "react";

export function useOverflows<T extends HTMLElement>() {
  const ref = useRef<T>(null);
  const [overflows, setOverflows] = useState(false);
  useEffect(() => {
    const box = ref.current;
    if (!box) return;
    const measure = () => setOverflows(box.scrollWidth > box.clientWidth + 1);
    measure();
    const observer = new ResizeObserver(measure);
    observer.observe(box);
    if (box.firstElementChild) observer.observe(box.firstElementChild);
    return () => observer.disconnect();
  }, []);
  return { ref, overflows };
}

/** The words under which a table wider than the screen slides. */
export const SLIDES_SIDEWAYS = "The table is wider than your screen: slide it sideways to see every column →";
