/**
 * Kernel side of the coherence-scan widget: measured visibilities against slit separation, the
 * fitted source (coherence) model on a fine grid and its delta-method confidence band.
 */
import { isFit, type Fit } from "../../src/api/fit.js";
import { InvalidArgumentError } from "../../src/errors.js";
import type { FitResult } from "../../src/fit/types.js";
import type { Model } from "../../src/physics/model.js";
import type { Profile } from "../../src/profile.js";
import { confidenceBand } from "../../src/report/figures/confidenceBand.js";
import { coherenceScanGrid } from "../../src/report/figures/coherenceScanFigure.js";
import type { ScanQuantity } from "../../widgets/shared/state.js";
import { display, MIME_BUNDLE, type MimeBundle } from "../display.js";
import { WidgetModel } from "../widget/model.js";
import { typedArraySerializer, type TypedArray } from "../widget/serializers.js";
import { fallbackBundle } from "./fallback.js";
import { widgetIdentity } from "./identity.js";

interface ScanState extends Record<string, unknown> {
  title: string;
  separation: TypedArray | null;
  visibility: TypedArray | null;
  visibility_err: TypedArray | null;
  curve_separation: TypedArray | null;
  curve_visibility: TypedArray | null;
  band_lower: TypedArray | null;
  band_upper: TypedArray | null;
  band_level: number;
  model_id: string;
  source_label: string;
  quantities: ScanQuantity[];
}

export interface CoherenceScanOptions {
  /** Confidence level of the band (default 0.95). */
  level?: number;
  /** Points of the drawn curve (default 300, as the paper figure). */
  curvePoints?: number;
  /** Legend text of the source model (default: the model description). */
  sourceLabel?: string;
  title?: string;
}

/** The coherence-scan widget. */
export class CoherenceScanWidget {
  readonly widget: WidgetModel<ScanState>;
  private readonly quantities: ScanQuantity[];

  /**
   * @param scan   Profile with x = slit separation (m), y = visibility, sigma = its uncertainty
   * @param result fit of `model` to the scan
   */
  constructor(scan: Profile, result: FitResult, model: Model, options: CoherenceScanOptions = {}) {
    if (scan.x.length < 2) throw new InvalidArgumentError("scan", scan.x.length, "two or more separations");
    // The paper figure's grid, so the widget's export is the figure the headless exporter makes.
    const grid = coherenceScanGrid(scan.x, options.curvePoints ?? 300);
    const band = confidenceBand(model, result, grid, options.level ?? 0.95);
    this.quantities = result.parameters.filter((p) => !p.fixed).map((p) => ({ name: p.name, unit: p.unit, value: p.value, uncertainty: Number.isFinite(p.uncertainty) ? p.uncertainty : null }));
    this.widget = new WidgetModel<ScanState>(widgetIdentity("CoherenceScan"), {
      title: options.title ?? "Coherence scan",
      separation: scan.x, visibility: scan.y, visibility_err: scan.sigma ?? null,
      curve_separation: grid, curve_visibility: band.center, band_lower: band.lower, band_upper: band.upper,
      band_level: band.level, model_id: result.modelId,
      source_label: options.sourceLabel ?? model.description,
      quantities: this.quantities,
    }, { serializers: Object.fromEntries(["separation", "visibility", "visibility_err", "curve_separation", "curve_visibility", "band_lower", "band_upper"].map((k) => [k, typedArraySerializer])) });
  }

  /** Widget view plus text/plain and text/html with the fitted source quantities. */
  [MIME_BUNDLE](): MimeBundle {
    const facts = this.quantities.map((q) => `${q.name} = ${q.value.toPrecision(6)} ± ${q.uncertainty === null ? "?" : q.uncertainty.toPrecision(2)} ${q.unit}`);
    return { ...this.widget.viewBundle(), ...fallbackBundle("Coherence scan", facts, null) };
  }

  display(): void {
    display(this);
  }

  close(): void {
    this.widget.close();
  }
}

/**
 * Visibility against separation with the fitted source model and its band, in a widget.
 * @example coherenceScan(discFit, { sourceLabel: "uniform disc" }) // discFit = fitProfile(scan, "coherence-disc", …)
 */
export function coherenceScan(fit: Fit, options?: CoherenceScanOptions): CoherenceScanWidget;
/** The same for a plain FitResult: give the scan (x = separation in m, y = visibility) and the model. */
export function coherenceScan(scan: Profile, result: FitResult, model: Model, options?: CoherenceScanOptions): CoherenceScanWidget;
export function coherenceScan(a: Profile | Fit, b?: FitResult | CoherenceScanOptions, model?: Model, options: CoherenceScanOptions = {}): CoherenceScanWidget {
  if (isFit(a)) return new CoherenceScanWidget(a.profile, a, a.fittedModel, (b as CoherenceScanOptions | undefined) ?? {});
  if (!model || !b) throw new InvalidArgumentError("coherenceScan", "a scan without its fit and model", "a fit from fitProfile, or (scan, result, model)");
  return new CoherenceScanWidget(a, b as FitResult, model, options);
}
