/**
 * One parameter's controls in the explorer: a range slider (keyboard-operable), the value in
 * display units, a fixed/free toggle, and bounds that open below the row.
 */
import type { ParameterSpec } from "../../src/physics/model.js";
import { h } from "./dom.js";
import { displayUnitFor, formatNumber, type DisplayUnit } from "./displayUnits.js";
import { sliderRange, type ParamState } from "../shared/preview.js";

const STEPS = 1000;

export interface ParamRowHandlers {
  /** Value moved (slider drag or typing): preview only, SI. */
  preview(name: string, value: number): void;
  /** Value, fixed flag or bounds settled: write to the model. */
  commit(name: string, state: ParamState): void;
}

/** A parameter row; `element` goes into the parameter list, `update` reflects new state. */
export class ParamRow {
  readonly element: HTMLDivElement;
  readonly unit: DisplayUnit;
  private readonly slider: HTMLInputElement;
  private readonly number: HTMLInputElement;
  private readonly fixedBox: HTMLInputElement;
  private readonly lowerInput: HTMLInputElement;
  private readonly upperInput: HTMLInputElement;
  private range: [number, number] = [0, 1];
  private state: ParamState;

  constructor(readonly spec: ParameterSpec, state: ParamState, private readonly handlers: ParamRowHandlers) {
    this.state = { ...state };
    const typical = state.value !== 0 ? state.value : spec.default;
    this.unit = displayUnitFor(spec.unit, typical);
    const label = this.unit.label ? `${spec.name} (${this.unit.label})` : spec.name;
    this.slider = h("input", {
      type: "range", min: 0, max: STEPS, step: 1, "aria-label": label, "data-param": spec.name,
      disabled: spec.integer === true,
    });
    this.number = h("input", {
      type: "number", step: "any", "aria-label": `${label} value`, "data-param-value": spec.name,
    });
    this.fixedBox = h("input", {
      type: "checkbox", title: "Hold fixed in the fit", "aria-label": `hold ${spec.name} fixed`, "data-param-fixed": spec.name,
      disabled: spec.integer === true,
    });
    this.lowerInput = h("input", { type: "number", step: "any", "aria-label": `${spec.name} lower bound` });
    this.upperInput = h("input", { type: "number", step: "any", "aria-label": `${spec.name} upper bound` });
    const name = h("span", { class: "fk-name", title: spec.description }, spec.name);
    const bounds = h("div", { class: "fk-bounds" }, "bounds", this.lowerInput, "…", this.upperInput);
    this.element = h("div", { class: "fk-param" },
      h("div", {}, name, h("div", { class: "fk-unit" }, this.unit.label || "—")),
      this.slider, this.number, this.fixedBox, h("span", {}), bounds);

    this.slider.addEventListener("input", () => {
      const value = this.fromSlider(Number(this.slider.value));
      this.number.value = formatNumber(value * this.unit.factor, 6);
      this.state.value = value;
      handlers.preview(spec.name, value);
    });
    this.slider.addEventListener("change", () => this.commitValue(this.fromSlider(Number(this.slider.value)), false));
    this.number.addEventListener("change", () => {
      const shown = Number(this.number.value);
      if (this.number.value.trim() === "" || !Number.isFinite(shown)) {
        this.number.setCustomValidity(`${spec.name}: enter a number`);
        this.number.reportValidity();
        return;
      }
      const value = Math.min(this.state.upper, Math.max(this.state.lower, shown / this.unit.factor));
      this.number.setCustomValidity("");
      this.commitValue(value, true);
    });
    this.fixedBox.addEventListener("change", () => {
      this.state.fixed = this.fixedBox.checked;
      this.element.classList.toggle("fk-fixed", this.state.fixed);
      handlers.commit(spec.name, { ...this.state });
    });
    const boundChange = (input: HTMLInputElement, key: "lower" | "upper") => () => {
      const text = input.value.trim();
      const bound = text === "" ? (key === "lower" ? -Infinity : Infinity) : Number(text) / this.unit.factor;
      const limit = key === "lower" ? spec.lower : spec.upper;
      const clipped = key === "lower" ? Math.max(limit, bound) : Math.min(limit, bound);
      if (!Number.isFinite(Number(text || 0))) return;
      this.state[key] = clipped;
      this.recenter();
      handlers.commit(spec.name, { ...this.state });
    };
    this.lowerInput.addEventListener("change", boundChange(this.lowerInput, "lower"));
    this.upperInput.addEventListener("change", boundChange(this.upperInput, "upper"));
    this.update(state);
  }

  /** Show bounds inputs (true) or hide them. */
  showBounds(open: boolean): void {
    this.element.classList.toggle("fk-open", open);
  }

  /** Reflect state coming from the model (kernel fit, another view). */
  update(state: ParamState): void {
    this.state = { ...state };
    this.number.value = formatNumber(state.value * this.unit.factor, 6);
    this.fixedBox.checked = state.fixed;
    this.element.classList.toggle("fk-fixed", state.fixed);
    this.lowerInput.value = Number.isFinite(state.lower) ? formatNumber(state.lower * this.unit.factor, 6) : "";
    this.upperInput.value = Number.isFinite(state.upper) ? formatNumber(state.upper * this.unit.factor, 6) : "";
    this.lowerInput.placeholder = "−∞";
    this.upperInput.placeholder = "+∞";
    this.recenter();
  }

  private commitValue(value: number, recenter: boolean): void {
    this.state.value = value;
    this.number.value = formatNumber(value * this.unit.factor, 6);
    if (recenter) this.recenter();
    this.handlers.preview(this.spec.name, value);
    this.handlers.commit(this.spec.name, { ...this.state });
  }

  /** Slider range follows the value so the slider always has room to both sides. */
  private recenter(): void {
    const zeroSpan = this.spec.unit === "rad" ? Math.PI : 100 / this.unit.factor;
    this.range = sliderRange(this.state.value, this.state.lower, this.state.upper, zeroSpan);
    this.slider.value = String(Math.round(((this.state.value - this.range[0]) / (this.range[1] - this.range[0])) * STEPS));
    this.slider.setAttribute("aria-valuetext", `${formatNumber(this.state.value * this.unit.factor, 4)} ${this.unit.label}`.trim());
  }

  private fromSlider(step: number): number {
    return this.range[0] + (step / STEPS) * (this.range[1] - this.range[0]);
  }
}
