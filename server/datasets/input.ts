// What an upload says about its file: name, description, declared format and each column's
// meaning. Shared by the upload form (react-hook-form + zod) and the upload route, so a field is
// refused with the same words in the browser and on the server.
import { z } from 'zod';
import { columnRoles, datasetFormats } from '../../db/schema';

export const MAX_DATASET_NAME = 120;
export const MAX_DATASET_DESCRIPTION = 2000;
export const MAX_QUANTITY = 200;
export const MAX_UNIT = 60;
export const MAX_COLUMNS = 200;

export const columnMeaningSchema = z.object({
  role: z.enum(columnRoles, { message: 'Choose what the column holds: x, y, error bar of y, or other.' }),
  quantity: z.string().trim().max(MAX_QUANTITY, `Keep the meaning to at most ${MAX_QUANTITY} characters.`).default(''),
  unit: z.string().trim().max(MAX_UNIT, `Keep the unit to at most ${MAX_UNIT} characters.`).default(''),
});
export type ColumnMeaning = z.output<typeof columnMeaningSchema>;

export const datasetMetaSchema = z
  .object({
    name: z
      .string({ message: 'Enter a name for the dataset.' })
      .trim()
      .min(1, 'Enter a name for the dataset.')
      .max(MAX_DATASET_NAME, `Keep the name to at most ${MAX_DATASET_NAME} characters.`),
    description: z
      .string()
      .trim()
      .max(MAX_DATASET_DESCRIPTION, `Keep the description to at most ${MAX_DATASET_DESCRIPTION} characters.`)
      .default(''),
    format: z.enum(datasetFormats, { message: 'Say whether the file is CSV or TSV.' }),
    columns: z
      .array(columnMeaningSchema, { message: 'Describe the columns of the file.' })
      .min(2, 'A dataset needs at least two columns: x and y.')
      .max(MAX_COLUMNS, `At most ${MAX_COLUMNS} columns.`),
  })
  .superRefine((meta, ctx) => {
    const count = (role: string) => meta.columns.filter((c) => c.role === role).length;
    for (const role of ['x', 'y'] as const) {
      const n = count(role);
      if (n !== 1) {
        ctx.addIssue({
          code: 'custom',
          path: ['columns'],
          message: n === 0 ? `Choose the column that holds ${role}.` : `Only one column can hold ${role}; ${n} do.`,
        });
      }
    }
    if (count('sigma') > 1) ctx.addIssue({ code: 'custom', path: ['columns'], message: 'Only one column can hold the error bars of y.' });
    meta.columns.forEach((column, i) => {
      if ((column.role === 'x' || column.role === 'y') && column.quantity === '') {
        ctx.addIssue({
          code: 'custom',
          path: ['columns', i, 'quantity'],
          message: `Say what ${column.role} means, e.g. “walk length T” or “reduced temperature t”.`,
        });
      }
    });
  });
export type DatasetMeta = z.output<typeof datasetMetaSchema>;
export type DatasetMetaInput = z.input<typeof datasetMetaSchema>;
