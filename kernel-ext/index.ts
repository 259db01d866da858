// Public API of fringekit's kernel extension ("fringekit/kernel"): for notebook cells and widgets.
export { registerCommTarget, openComm } from "./comm/api.js";
export type { Comm, CommTargetHandler, CommMessageListener, CommCloseListener, JsonObject, BufferLike } from "./comm/types.js";
export { WidgetModel, WIDGET_PROTOCOL_VERSION, WIDGET_COMM_TARGET, WIDGET_VIEW_MIME } from "./widget/model.js";
export type { WidgetIdentity, WidgetModelOptions, ChangeListener, ChangeSource, CustomListener } from "./widget/model.js";
export { typedArraySerializer, ndArraySerializer, toWireArray, fromWireArray, dtypeOf } from "./widget/serializers.js";
export type { Serializer, TypedArray, NdArray, WireArray, DType } from "./widget/serializers.js";
export { removeBuffers, putBuffers } from "./widget/buffers.js";
export type { BufferPath, SplitState } from "./widget/buffers.js";
export { liveWidgetCount, WIDGET_CONTROL_TARGET } from "./widget/registry.js";
export { display, updateDisplay, clearOutput, mimeBundleOf, hasMimeBundle, plainText, MIME_BUNDLE } from "./display.js";
export type { MimeBundle, MimeBundleProvider, DisplayContent, DisplayOptions } from "./display.js";
export { interruptSignal } from "./interrupt.js";
export { getRuntime, NotInKernelError } from "./runtime.js";
export type { KernelRuntime } from "./runtime.js";
export { installKernelspec, kernelSpecFor, KERNEL_NAME, KERNEL_DISPLAY_NAME } from "./install.js";
export type { InstallKernelspecOptions, InstalledKernelspec, KernelSpec } from "./install.js";
