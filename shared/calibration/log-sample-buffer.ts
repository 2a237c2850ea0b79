/**
 * A growing column of Float64 samples kept as fixed blocks, so appending never copies what is
 * already held and memory follows the sample count (8 bytes a value), not a doubling capacity.
 */

/** Values per block: 512 KiB, small enough that the last, partly filled block wastes little. */
export const SAMPLE_BLOCK = 65_536;

export class SampleBuffer {
  private blocks: Float64Array[] = [];
  private fill = SAMPLE_BLOCK;
  private count = 0;

  get length(): number {
    return this.count;
  }

  push(value: number): void {
    if (this.fill === SAMPLE_BLOCK) {
      this.blocks.push(new Float64Array(SAMPLE_BLOCK));
      this.fill = 0;
    }
    this.blocks[this.blocks.length - 1]![this.fill++] = value;
    this.count++;
  }

  /** The value at an index below length. */
  at(index: number): number {
    return this.blocks[Math.floor(index / SAMPLE_BLOCK)]![index % SAMPLE_BLOCK]!;
  }

  /** The last value, or NaN when empty (callers check length first). */
  last(): number {
    return this.count === 0 ? Number.NaN : this.at(this.count - 1);
  }

  /** One contiguous array; the blocks are released as they are copied, so the peak is the array plus one block. */
  take(): Float64Array {
    const out = new Float64Array(this.count);
    let offset = 0;
    for (let i = 0; i < this.blocks.length; i++) {
      const n = Math.min(SAMPLE_BLOCK, this.count - offset);
      out.set(this.blocks[i]!.subarray(0, n), offset);
      offset += n;
      this.blocks[i] = new Float64Array(0);
    }
    this.blocks = [];
    this.fill = SAMPLE_BLOCK;
    this.count = 0;
    return out;
  }
}
