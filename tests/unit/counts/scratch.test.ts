import { describe, expect, it } from "vitest";

import { lendFloat64, lendInt32 } from "@/lib/counts/scratch";
import { assignDaySlots } from "@/lib/counts/series";

describe("lent typed arrays", () => {
  it("lend the same memory again under one key, more when asked for more, and never share it between keys", () => {
    const first = lendInt32("test:a", 100);
    expect(first).toHaveLength(100);
    first.fill(7);
    const again = lendInt32("test:a", 80);
    expect(again).toHaveLength(80);
    expect(again.buffer).toBe(first.buffer);
    // Not cleared: the borrower writes before it reads.
    expect(again[0]).toBe(7);
    const larger = lendInt32("test:a", 10_000);
    expect(larger).toHaveLength(10_000);
    expect(larger.buffer).not.toBe(first.buffer);
    larger.fill(3);

    const other = lendFloat64("test:b", 100);
    expect(other.buffer).not.toBe(larger.buffer);
    other.fill(0.5);
    expect(lendInt32("test:a", 100)[0]).toBe(3);
  });

  it("take the day slots assignDaySlots writes, which must be as many as the days", () => {
    const days = Int32Array.from([20_000, 20_002, 20_000, 20_001]);
    const slots = lendInt32("test:slots", days.length).fill(-9);
    expect(assignDaySlots(days, slots)).toEqual(assignDaySlots(days));
    expect([...slots]).toEqual([0, 2, 0, 1]);
    expect(() => assignDaySlots(days, new Int32Array(3))).toThrow(RangeError);
  });
});
