/**
 * Rich display of values in notebooks: the mime-bundle protocol and the `display` helper.
 *
 * Protocol: an object offers a rich view by having a method under
 * `Symbol.for("fringekit.mimeBundle")` (exported as MIME_BUNDLE) or a method `toMimeBundle()`
 * returning a bundle such as {"text/plain": "...", "text/html": "...", "text/markdown": "...",
 * "application/vnd.plotly.v1+json": {data, layout}}. Code in src/ can implement it without
 * importing this module: `[Symbol.for("fringekit.mimeBundle")]() { return {...}; }`.
 * The kernel uses it for a cell's last expression (execute_result) and for `display(value)`.
 */
import { randomUUID } from "node:crypto";
import { inspect } from "node:util";
import { requireRuntime } from "./runtime.js";

/** The registered symbol of the mime-bundle method (`Symbol.for("fringekit.mimeBundle")`). */
export const MIME_BUNDLE: unique symbol = Symbol.for("fringekit.mimeBundle");

/** A mime bundle: mime type → content (text types as strings, JSON types as objects). */
export interface MimeBundle {
  "text/plain"?: string;
  "text/html"?: string;
  "text/markdown"?: string;
  "application/vnd.plotly.v1+json"?: unknown;
  [mimeType: string]: unknown;
}

/** An object that renders itself richly. */
export interface MimeBundleProvider {
  [MIME_BUNDLE](): MimeBundle;
}

/** The display_data payload for one value. */
export interface DisplayContent {
  data: MimeBundle & { "text/plain": string };
  metadata: Record<string, unknown>;
}

const MIME_TYPE = /^[a-z]+\/[a-z0-9.+-]+$/i;

/** Plain-text view of any value as Node's REPL shows it (strings quoted). */
export function plainText(value: unknown): string {
  return inspect(value, { depth: 4, colors: false });
}

/**
 * The mime bundle of `value`: from its MIME_BUNDLE or toMimeBundle method when it has one,
 * always with a "text/plain" entry. Throws TypeError naming the bad entry when the method
 * returns something that is not a bundle.
 */
export function mimeBundleOf(value: unknown): DisplayContent {
  const method = bundleMethod(value);
  if (!method) return { data: { "text/plain": plainText(value) }, metadata: {} };
  const bundle: unknown = method.call(value);
  if (bundle === null || typeof bundle !== "object" || Array.isArray(bundle)) {
    throw new TypeError(`mime bundle of ${describe(value)}: expected an object {mimeType: content}, got ${plainText(bundle)}`);
  }
  const data: MimeBundle = {};
  for (const [mime, content] of Object.entries(bundle)) {
    if (!MIME_TYPE.test(mime)) throw new TypeError(`mime bundle of ${describe(value)}: ${JSON.stringify(mime)} is not a mime type`);
    if (content === undefined) continue;
    const jsonType = mime.endsWith("+json") || mime === "application/json";
    if (!jsonType && typeof content !== "string") {
      throw new TypeError(`mime bundle of ${describe(value)}: ${mime} must be a string, got ${typeof content}`);
    }
    data[mime] = content;
  }
  const plain = typeof data["text/plain"] === "string" ? data["text/plain"] : plainText(value);
  return { data: { ...data, "text/plain": plain }, metadata: {} };
}

/** True when `value` offers the mime-bundle protocol. */
export function hasMimeBundle(value: unknown): boolean {
  return bundleMethod(value) !== undefined;
}

/** Options of `display`. */
export interface DisplayOptions {
  /** Id under which `updateDisplay` can replace this output later. */
  displayId?: string;
  /** Extra display metadata (per mime type). */
  metadata?: Record<string, unknown>;
}

/**
 * Shows `value` in the current cell's output (display_data) using its mime bundle.
 * Example: `display(fitResult)`; `display(table, {displayId: "table"})` then
 * `updateDisplay("table", newTable)` replaces that output.
 */
export function display(value: unknown, options: DisplayOptions = {}): void {
  publishDisplay("display_data", value, options.displayId ?? randomUUID(), options.metadata);
}

/**
 * Shows Jupyter's clear_output: empties the current cell's output (`wait`: when the next
 * output arrives, which avoids flicker in loops).
 */
export function clearOutput(wait = false): void {
  requireRuntime("clearOutput").publish("clear_output", { wait });
}

/** Replaces the output shown earlier under `displayId` with `value` (update_display_data). */
export function updateDisplay(displayId: string, value: unknown, metadata?: Record<string, unknown>): void {
  if (typeof displayId !== "string" || displayId === "") throw new TypeError(`invalid displayId: ${JSON.stringify(displayId)} (the id display() returned)`);
  publishDisplay("update_display_data", value, displayId, metadata);
}

function publishDisplay(msgType: string, value: unknown, displayId: string, metadata?: Record<string, unknown>): void {
  const runtime = requireRuntime("display");
  const content = mimeBundleOf(value);
  runtime.publish(msgType, {
    data: content.data,
    metadata: { ...content.metadata, ...(metadata ?? {}) },
    transient: { display_id: displayId },
  });
}

function bundleMethod(value: unknown): (() => unknown) | undefined {
  if (value === null || (typeof value !== "object" && typeof value !== "function")) return undefined;
  const record = value as Record<PropertyKey, unknown>;
  if (typeof record[MIME_BUNDLE] === "function") return record[MIME_BUNDLE] as () => unknown;
  if (typeof record.toMimeBundle === "function") return record.toMimeBundle as () => unknown;
  return undefined;
}

function describe(value: unknown): string {
  const name = (value as { constructor?: { name?: string } })?.constructor?.name;
  return name ? `a ${name}` : typeof value;
}
