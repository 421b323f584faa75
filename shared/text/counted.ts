/** "1 closure", "2 closures", "0 closures": a count with its noun in the right number (English). */
export function counted(n: number, singular: string, plural = `${singular}s`): string {
  return `${n} ${n === 1 ? singular : plural}`;
}
