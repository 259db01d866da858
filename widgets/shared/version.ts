/**
 * Names and versions the widget protocol uses to find fringekit's views.
 * The protocol version is the Jupyter widget message protocol, kept apart from the package version.
 */

/** `_model_module` / `_view_module` of every fringekit widget. */
export const MODULE_NAME = "fringekit-widgets";
/** `_model_module_version` / `_view_module_version` (semver of the widget module). */
export const MODULE_VERSION = "0.1.0";
/** Jupyter widget message protocol these widgets speak (common practice: ipywidgets 8 speaks 2.1). */
export const PROTOCOL_VERSION = "2.1.0";
