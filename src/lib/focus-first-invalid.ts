/**
 * After a form's errors render, put the keyboard focus on its first invalid control so a keyboard or
 * screen-reader user lands on the message instead of hunting for it.
 */
export function focusFirstInvalid(form: HTMLFormElement): void {
  requestAnimationFrame(() => {
    form.querySelector<HTMLElement>('[aria-invalid="true"]')?.focus();
  });
}
