export function median(xs: readonly number[]): number;
export function round(v: number): number;
