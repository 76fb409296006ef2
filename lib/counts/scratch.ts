/**
 * Typed arrays lent to one synchronous computation and lent again to the
 * next one on the same thread, instead of fresh ones each time. The full
 * recompute fits 25 or more periods of tens of thousands of counts, each
 * needing a dozen arrays as long as the period; made fresh, they came to
 * some 60 MB per recompute, and the collections that memory set off took
 * 40–60 ms of it.
 *
 * A lent array is not cleared: it holds whatever the last borrower left,
 * so a borrower must write every element before it reads it. It belongs to
 * its borrower only until the borrower returns (no await in between, and
 * nothing that outlives the call may keep it). Each place that borrows
 * uses its own key, so two arrays in use at once never share memory.
 */

const buffers = new Map<string, ArrayBuffer>();

function lend(key: string, bytes: number): ArrayBuffer {
  let buffer = buffers.get(key);
  if (!buffer || buffer.byteLength < bytes) {
    // A quarter more than asked, so a slightly longer period does not
    // allocate again.
    buffer = new ArrayBuffer(Math.ceil((bytes * 1.25) / 8) * 8);
    buffers.set(key, buffer);
  }
  return buffer;
}

export function lendInt32(key: string, length: number): Int32Array {
  return new Int32Array(lend(key, 4 * length), 0, length);
}

export function lendFloat64(key: string, length: number): Float64Array {
  return new Float64Array(lend(key, 8 * length), 0, length);
}
