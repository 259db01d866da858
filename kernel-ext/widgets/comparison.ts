/**
 * Kernel side of the model-comparison widget: several fits of one profile, compared with
 * compareFits (information criteria, Akaike weights, nested tests) and drawn together.
 */
import { compare, Comparison, type FitsToCompare } from "../../src/api/compare.js";
import { InvalidArgumentError } from "../../src/errors.js";
import type { FitResult } from "../../src/fit/types.js";
import type { Profile } from "../../src/profile.js";
import { comparisonReport } from "../../src/report/tableReport.js";
import { compareFits } from "../../src/stats/compareFits.js";
import { comparisonRows } from "../../src/stats/comparisonRows.js";
import type { ComparisonResult, CompareOptions } from "../../src/stats/comparisonTypes.js";
import type { ComparisonTableRow } from "../../widgets/shared/state.js";
import { display, MIME_BUNDLE, type MimeBundle } from "../display.js";
import { WidgetModel } from "../widget/model.js";
import { ndArraySerializer, typedArraySerializer, type NdArray, type TypedArray } from "../widget/serializers.js";
import { fallbackBundle } from "./fallback.js";
import { widgetIdentity } from "./identity.js";

interface ComparisonState extends Record<string, unknown> {
  title: string;
  x: TypedArray | null;
  y: TypedArray | null;
  y_unit: string;
  curves: NdArray | null;
  residuals: NdArray | null;
  table: ComparisonTableRow[];
  verdict: string;
}

/** A fit with the name shown in the table and legend. */
export interface LabelledResult {
  label: string;
  result: FitResult;
}

/** The comparison widget; `comparison` holds compareFits' result for cell code. */
export class ComparisonWidget {
  readonly widget: WidgetModel<ComparisonState>;
  readonly comparison: ComparisonResult;
  private readonly fits: LabelledResult[];

  constructor(profile: Profile, fits: readonly (FitResult | LabelledResult)[], options: CompareOptions & { title?: string } = {}) {
    if (!Array.isArray(fits) || fits.length < 2) throw new InvalidArgumentError("fits", fits?.length, "two or more fits of the same profile");
    const used = new Map<string, number>();
    this.fits = fits.map((f) => {
      const entry = "result" in f ? f : { label: f.modelId, result: f };
      const count = used.get(entry.label) ?? 0;
      used.set(entry.label, count + 1);
      return count === 0 ? entry : { label: `${entry.label} (${count + 1})`, result: entry.result };
    });
    const n = profile.x.length;
    for (const f of this.fits) {
      if (f.result.model.length !== n) throw new InvalidArgumentError(`fit ${f.label}`, `${f.result.model.length} points`, `a fit of this profile (${n} points)`);
    }
    this.comparison = compareFits(this.fits.map((f) => ({ fit: f.result, label: f.label })), { profile, ...options });
    const rows = this.comparison.rows;
    const ordered = rows.map((r) => this.fits.find((f) => f.label === r.label)!);
    const curves = new Float64Array(ordered.length * n);
    const residuals = new Float64Array(ordered.length * n);
    ordered.forEach((f, k) => {
      curves.set(f.result.model, k * n);
      residuals.set(f.result.residuals, k * n);
    });
    this.widget = new WidgetModel<ComparisonState>(widgetIdentity("Comparison"), {
      title: options.title ?? "Model comparison",
      x: profile.x, y: profile.y, y_unit: profile.yUnit,
      curves: { data: curves, shape: [ordered.length, n] },
      residuals: { data: residuals, shape: [ordered.length, n] },
      table: comparisonRows(this.comparison),
      verdict: this.comparison.verdict,
    }, { serializers: { x: typedArraySerializer, y: typedArraySerializer, curves: ndArraySerializer, residuals: ndArraySerializer } });
  }

  /** Widget view plus text/plain and text/html (the comparison table and verdict). */
  [MIME_BUNDLE](): MimeBundle {
    return { ...this.widget.viewBundle(), ...fallbackBundle("Model comparison", [this.comparison.verdict], comparisonReport(this.comparison, { fits: this.fits })) };
  }

  display(): void {
    display(this);
  }

  close(): void {
    this.widget.close();
  }
}

/**
 * Compare fits in a widget (fits overlaid, residuals, table, verdict): a Comparison from
 * compare(), fits by label, or a profile with its fits.
 * @example comparison(compare({ ideal, broadband }), { title: "line A" })
 */
export function comparison(fits: Comparison | FitsToCompare, options?: CompareOptions & { title?: string }): ComparisonWidget;
export function comparison(profile: Profile, fits: readonly (FitResult | LabelledResult)[], options?: CompareOptions & { title?: string }): ComparisonWidget;
export function comparison(
  a: Profile | Comparison | FitsToCompare,
  b?: readonly (FitResult | LabelledResult)[] | (CompareOptions & { title?: string }),
  options: CompareOptions & { title?: string } = {},
): ComparisonWidget {
  const isProfile = (v: unknown): v is Profile => typeof v === "object" && v !== null && (v as Profile).x instanceof Float64Array;
  if (isProfile(a)) return new ComparisonWidget(a, b as readonly (FitResult | LabelledResult)[], options);
  const opts = (b as (CompareOptions & { title?: string }) | undefined) ?? {};
  const { title, ...compareOptions } = opts;
  const done = a instanceof Comparison ? a : compare(a as FitsToCompare, compareOptions);
  return new ComparisonWidget(done.profile, done.fits.map((f) => ({ label: f.label, result: f.fit })), { ...compareOptions, title });
}
