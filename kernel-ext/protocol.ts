// Kernel protocol internals ("fringekit/kernel-protocol"): comms, widget models and their wire
// format, the runtime, kernelspec installation. For widget authors and tools; notebook cells
// need only "fringekit/kernel" (display and interrupt). Re-exports only.
export { registerCommTarget, openComm } from "./comm/api.js";
export type { Comm, CommTargetHandler, CommMessageListener, CommCloseListener, JsonObject, BufferLike } from "./comm/types.js";
export { WidgetModel, WIDGET_PROTOCOL_VERSION, WIDGET_COMM_TARGET, WIDGET_VIEW_MIME } from "./widget/model.js";
export type { WidgetIdentity, WidgetModelOptions, ChangeListener, ChangeSource, CustomListener } from "./widget/model.js";
export { typedArraySerializer, ndArraySerializer, toWireArray, fromWireArray, dtypeOf } from "./widget/serializers.js";
export type { Serializer, TypedArray, NdArray, WireArray, DType } from "./widget/serializers.js";
export { removeBuffers, putBuffers } from "./widget/buffers.js";
export type { BufferPath, SplitState } from "./widget/buffers.js";
export { liveWidgetCount, WIDGET_CONTROL_TARGET } from "./widget/registry.js";
export { mimeBundleOf, hasMimeBundle, plainText, MIME_BUNDLE } from "./display.js";
export { getRuntime, NotInKernelError } from "./runtime.js";
export type { KernelRuntime } from "./runtime.js";
export { installKernelspec, kernelSpecFor, KERNEL_NAME, KERNEL_DISPLAY_NAME } from "./install.js";
export type { InstallKernelspecOptions, InstalledKernelspec, KernelSpec } from "./install.js";
