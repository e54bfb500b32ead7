// The demo's invented dataset: mean-square end-to-end distances of walks of length T in four
// dimensions from a made-up simulation, R² = 1.31 T (ln T)^(1/4) with 0.4% scatter and error bars.
// Every number is invented for the demo.
import { createHash } from 'node:crypto';
import type { Tx } from './client';
import * as schema from './schema';

// Invented scatter, in units of the error bar (one standard deviation).
const scatter = [0.31, -1.12, 0.54, 1.47, -0.23, -0.86, 0.08, 1.02, -1.61, 0.44, -0.05, 0.77, -0.39, 1.26, -0.92, 0.18];

export const demoDatasetName = 'Walk sizes, d = 4 (invented simulation)';

export function demoDatasetRows(): { T: number; R2: number; err: number }[] {
  return scatter.map((z, k) => {
    const T = 100 * 2 ** k;
    const truth = 1.31 * T * Math.log(T) ** 0.25;
    const err = Number((truth * 0.004).toPrecision(4));
    return { T, R2: Number((truth + z * err).toPrecision(8)), err };
  });
}

/** Adds the dataset to the demo group inside the demo's transaction. */
export async function insertDemoDataset(tx: Tx, groupId: string, uploadedBy: string): Promise<void> {
  const rows = demoDatasetRows();
  const fileText = ['T,R2,err', ...rows.map((r) => `${r.T},${r.R2},${r.err}`)].join('\n') + '\n';
  const bytes = new TextEncoder().encode(fileText);
  const [dataset] = await tx
    .insert(schema.datasets)
    .values({
      groupId,
      name: demoDatasetName,
      description: 'Invented numbers for the demo: 16 walk lengths from 100 to 3.3 million steps, each with its standard error.',
      fileName: 'walk-sizes-d4.csv',
      format: 'csv',
      fileText,
      fileBytes: bytes.byteLength,
      fileSha256: createHash('sha256').update(bytes).digest('hex'),
      rowCount: rows.length,
      uploadedBy,
    })
    .returning({ id: schema.datasets.id });
  const column = (position: number, header: string, role: schema.ColumnRole, quantity: string, unit: string, values: number[]) => ({
    datasetId: dataset!.id,
    position,
    header,
    role,
    quantity,
    unit,
    numeric: true,
    values,
  });
  await tx.insert(schema.datasetColumns).values([
    column(0, 'T', 'x', 'walk length T', 'steps', rows.map((r) => r.T)),
    column(1, 'R2', 'y', 'mean-square end-to-end distance', 'lattice spacings²', rows.map((r) => r.R2)),
    column(2, 'err', 'sigma', 'standard error of the mean', 'lattice spacings²', rows.map((r) => r.err)),
  ]);
}
