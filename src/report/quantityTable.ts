/**
 * A table of derived quantities (fringe spacing, wavelength, |γ12|, coherence length, source
 * size, ...): each value ± standard uncertainty with its unit (GUM 7.2.6 rounding) and a note.
 */
import { InvalidArgumentError } from "../errors.js";
import type { DerivedQuantity } from "../stats/quantity.js";
import { formatQuantity, type FormatOptions } from "./formatQuantity.js";
import { parameterLabel } from "./labels.js";
import type { ReportTable, ReportTableRow } from "./table.js";

/** A value ± standard uncertainty in an SI unit: the shape stats' derivedQuantities returns. */
export type QuantityRow = DerivedQuantity;

/** Options of quantityTable: caption, number format, notes. */
export interface QuantityTableOptions {
  caption?: string;
  format?: FormatOptions;
  notes?: string[];
}

/** Build the table of `quantities` (names and notes are user-visible text, escaped on output). */
export function quantityTable(quantities: readonly QuantityRow[], options: QuantityTableOptions = {}): ReportTable {
  if (!Array.isArray(quantities)) throw new InvalidArgumentError("quantities", quantities, "a list of {name, value, uncertainty, unit}");
  const rows: ReportTableRow[] = quantities.map((q) => ({
    cells: [
      { label: parameterLabel(q.name) },
      { quantity: formatQuantity(q.value, Number.isNaN(q.uncertainty) ? Infinity : q.uncertainty, q.unit, options.format) },
      q.note ?? "",
    ],
  }));
  return {
    caption: options.caption ?? "Derived quantities",
    columns: ["Quantity", "Value", "Note"],
    align: ["l", "l", "l"],
    rows,
    notes: ["Standard uncertainties rounded to two significant digits (JCGM 100:2008, 7.2.6).", ...(options.notes ?? [])],
  };
}
