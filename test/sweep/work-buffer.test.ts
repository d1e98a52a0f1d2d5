import { describe, expect, it } from 'vitest';
import { sharesMemory } from '../../src/sweep/shares-memory.js';
import { adoptWorkBuffer, currentWorkBuffer, releaseWorkBuffer, workBuffer } from '../../src/sweep/work-buffer.js';

describe('work buffer', () => {
  it('is one array per length, replaced for another length and dropped on release', () => {
    releaseWorkBuffer();
    expect(currentWorkBuffer()).toBeNull();
    const a = workBuffer(12);
    expect(a.length).toBe(12);
    expect(workBuffer(12)).toBe(a);
    expect(currentWorkBuffer()).toBe(a);
    const b = workBuffer(20);
    expect(b).not.toBe(a);
    expect(b.length).toBe(20);
    releaseWorkBuffer();
    expect(currentWorkBuffer()).toBeNull();
  });
  it('adopts an array the caller gives up and hands it out for its length', () => {
    const planted = new Float32Array(50);
    const stage = planted.subarray(10);
    adoptWorkBuffer(stage);
    expect(currentWorkBuffer()).toBe(stage);
    expect(workBuffer(40)).toBe(stage);
    expect(workBuffer(50)).not.toBe(stage);
    releaseWorkBuffer();
  });
  it('tells arrays that share memory from those that do not', () => {
    const a = new Float32Array(10);
    expect(sharesMemory(a, a)).toBe(true);
    expect(sharesMemory(a.subarray(2, 4), a.subarray(3, 8))).toBe(true);
    expect(sharesMemory(a.subarray(0, 3), a.subarray(3))).toBe(false);
    expect(sharesMemory(a, new Float32Array(10))).toBe(false);
  });
});
