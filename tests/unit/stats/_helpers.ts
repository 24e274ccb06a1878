/** Round to 4 decimals, the precision the published tables give. */
export function r4(value: number): number {
  return Math.round(value * 1e4) / 1e4;
}
