/** After a refused save, puts the focus on the first field marked wrong (once the marks have rendered). */
export function focusFirstProblem(): void {
  setTimeout(() => document.querySelector<HTMLElement>('main [aria-invalid="true"]')?.focus(), 0);
}
