/**
 * Numbers as text for the text exports: fixed decimals chosen from the largest magnitude in the
 * data, so that every coordinate keeps seven significant digits relative to the model's size
 * (finer than float32 resolution there) and formatting stays a multiply, a round and a
 * conversion.
 */
export function decimalFormatter(values: ArrayLike<number>): (x: number) => string {
  let largest = 0;
  for (let i = 0; i < values.length; i++) largest = Math.max(largest, Math.abs(values[i]));
  const decimals = Math.min(12, Math.max(0, 7 - Math.ceil(Math.log10(largest || 1))));
  const scale = 10 ** decimals;
  return (x: number) => String(Math.round(x * scale) / scale);
}
