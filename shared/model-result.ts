/**
 * What one model run returns, as it travels (worker → queue → store) and as `disksweep model --json` prints
 * it. Deterministic outputs and the timing part are apart so two runs can be compared bit for bit.
 */
import { z } from 'zod';
import { CHECKPOINT_OUTPUTS, SCALAR_OUTPUTS, SERIES_COLUMNS, type OutputDescriptor } from './model-outputs.js';

/** Numerical outcome of a run; anything but `ok` carries a reason. */
export const MODEL_STATUSES = ['ok', 'step_limit', 'step_collapse', 'non_finite', 'budget_error'] as const;
export type ModelStatus = (typeof MODEL_STATUSES)[number];

function valueSchema(d: OutputDescriptor) {
  const base = d.type === 'flag' ? z.boolean() : z.number();
  return d.nullable ? base.nullable() : base;
}

const checkpointShape = Object.fromEntries([
  ['t_myr', z.number()],
  ...CHECKPOINT_OUTPUTS.map((d) => [d.name, valueSchema(d)]),
]) as Record<'t_myr' | (typeof CHECKPOINT_OUTPUTS)[number]['name'], z.ZodType<number | null>>;

const scalarShape = Object.fromEntries(SCALAR_OUTPUTS.map((d) => [d.name, valueSchema(d)])) as unknown as Record<
  (typeof SCALAR_OUTPUTS)[number]['name'],
  z.ZodType<number | boolean | null>
>;

export const checkpointRecordSchema = z.object(checkpointShape).strict();
export const scalarRecordSchema = z.object(scalarShape).strict();

export const seriesSchema = z.object({
  columns: z.array(z.enum(SERIES_COLUMNS)),
  n_samples: z.number().int().nonnegative(),
  /** n_samples × columns.length float32 values, little-endian, row-major, base64. */
  f32le_base64: z.string(),
});

export const modelResultSchema = z.object({
  model_version: z.string(),
  status: z.enum(MODEL_STATUSES),
  status_reason: z.string().nullable(),
  scalars: scalarRecordSchema,
  checkpoints: z.array(checkpointRecordSchema),
  series: seriesSchema,
  timing: z.object({
    wall_ms: z.number().nonnegative(),
    steps: z.number().int().nonnegative(),
    rejected_steps: z.number().int().nonnegative(),
  }),
});

export type ModelResult = z.infer<typeof modelResultSchema>;
export type CheckpointRecord = z.infer<typeof checkpointRecordSchema>;
export type ScalarRecord = z.infer<typeof scalarRecordSchema>;
export type Series = z.infer<typeof seriesSchema>;

/** Pack rows of series values as float32 little-endian base64 (compact and exact to float32). */
export function encodeSeries(rows: readonly (readonly number[])[]): Series {
  const width = SERIES_COLUMNS.length;
  const bytes = new DataView(new ArrayBuffer(rows.length * width * 4));
  rows.forEach((row, r) => row.forEach((v, c) => bytes.setFloat32((r * width + c) * 4, v, true)));
  return {
    columns: [...SERIES_COLUMNS],
    n_samples: rows.length,
    f32le_base64: Buffer.from(bytes.buffer).toString('base64'),
  };
}

/** The inverse of encodeSeries: one Float32Array per column. */
export function decodeSeries(series: Series): Record<string, Float32Array> {
  const buf = Buffer.from(series.f32le_base64, 'base64');
  const width = series.columns.length;
  if (buf.length !== series.n_samples * width * 4) {
    throw new RangeError(`series: expected ${series.n_samples * width * 4} bytes, got ${buf.length}`);
  }
  const view = new DataView(buf.buffer, buf.byteOffset, buf.byteLength);
  const out: Record<string, Float32Array> = {};
  series.columns.forEach((name, c) => {
    const col = new Float32Array(series.n_samples);
    for (let r = 0; r < series.n_samples; r++) col[r] = view.getFloat32((r * width + c) * 4, true);
    out[name] = col;
  });
  return out;
}
