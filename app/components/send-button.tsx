// A form's submit button that stays focusable while the form is being sent. A `disabled` button drops
// keyboard focus to the page the moment it is pressed; this one says it is busy (aria-disabled, dimmed)
// and ignores further presses, including Enter in one of the form's fields, until the answer arrives.
import type { ButtonHTMLAttributes } from "react";

export function SendButton({ busy, onClick, ...button }: Omit<ButtonHTMLAttributes<HTMLButtonElement>, "type" | "disabled"> & { busy: boolean }) {
  return (
    <button
      type="submit"
      aria-disabled={busy || undefined}
      onClick={(event) => {
        if (busy) event.preventDefault();
        else onClick?.(event);
      }}
      {...button}
    />
  );
}
