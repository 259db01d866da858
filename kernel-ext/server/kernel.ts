/**
 * The fringekit kernel's message handling, installed into tslab's ZmqServer in place of its
 * handleShellMessage. tslab keeps its sockets, heartbeat, TypeScript converter and executor;
 * this class owns the wire format (binary buffers, HMAC), execution (execute_input,
 * execute_result with rich bundles, proper errors, no abort of the next cell), comms,
 * is_complete, history and interrupts. Output is routed to the request being handled through
 * AsyncLocalStorage, so prints from a comm handler land under that comm message.
 */
import { AsyncLocalStorage } from "node:async_hooks";
import { randomUUID } from "node:crypto";
import { CommRegistry } from "../comm/registry.js";
import { mimeBundleOf, plainText } from "../display.js";
import type { KernelRuntime, PublishOptions } from "../runtime.js";
import { toBuffer } from "../runtime.js";
import type { ExecutorConsole, TslabExecutor, TslabInternals } from "../tslabPin.js";
import { checkCompleteness, type TranspileApi } from "./completeness.js";
import { errorContentFrom, errorContentOf, type ErrorContent } from "./errors.js";
import { encodeFrames, makeHeader, parseFrames, SerialSender, SignatureHistory, type MessageHeader, type SendingSocket, type WireMessage } from "./wire.js";

/** The parts of tslab's ZmqServer instance the kernel uses (set up by its init()). */
export interface TslabServer {
  connInfo: { key: string; signature_scheme?: string };
  iopub: SendingSocket;
  shell: SendingSocket;
  control: SendingSocket;
  handler: {
    executor: TslabExecutor;
    handleKernel(): Record<string, unknown>;
    handleComplete(content: unknown): Record<string, unknown>;
    handleInspect(content: unknown): Record<string, unknown>;
  };
  close(): void;
}

interface RequestContext {
  parent: MessageHeader;
}

interface Capture {
  value?: { v: unknown };
  errors: unknown[][];
}

/** Kernel implementation details reported in kernel_info. */
export interface KernelIdentity {
  implementation: string;
  implementationVersion: string;
}

/**
 * The kernel side of one session: answers Jupyter shell/control requests over the wire
 * protocol, runs code through the runtime and routes comm messages.
 */
export class FringekitKernel {
  readonly session = randomUUID();
  readonly comms: CommRegistry;
  readonly runtime: KernelRuntime;
  private readonly context = new AsyncLocalStorage<RequestContext>();
  private server: TslabServer | undefined;
  private readonly senders = new Map<SendingSocket, SerialSender>();
  private lastExecuteParent: MessageHeader | undefined;
  private capture: Capture | undefined;
  private executionCount = 0;
  private executionQueue: Promise<unknown> = Promise.resolve();
  private interruptController = new AbortController();
  /** Signatures of accepted messages: a captured message cannot be replayed. */
  private readonly signatures = new SignatureHistory();

  /**
   * @param tslab the verified tslab internals
   * @param log writes a line to the kernel's own log (the real stderr, not a cell)
   */
  constructor(
    private readonly tslab: TslabInternals,
    private readonly log: (line: string) => void,
    private readonly identity: KernelIdentity,
  ) {
    this.comms = new CommRegistry((type, content, options) => this.publish(type, content, options), (line) => this.log(line));
    this.runtime = {
      apiVersion: 1,
      publish: (type, content, options) => this.publish(type, content, options),
      comms: this.comms,
      interruptSignal: () => this.interruptController.signal,
    };
  }

  /** The console object handed to tslab's executor: captures the last value and failures. */
  readonly executorConsole: ExecutorConsole = {
    log: (...args: unknown[]) => {
      if (this.capture && args.length === 1) this.capture.value = { v: args[0] };
      else this.log(args.map((a) => plainText(a)).join(" "));
    },
    error: (...args: unknown[]) => {
      if (this.capture) this.capture.errors.push(args);
      else this.log(args.map((a) => plainText(a)).join(" "));
    },
  };

  /** Publishes on iopub with the current request (or the last cell) as parent. */
  publish(msgType: string, content: Record<string, unknown>, options: PublishOptions = {}): void {
    const server = this.server;
    if (!server) {
      this.log(`dropped ${msgType}: kernel sockets not ready`);
      return;
    }
    const parent = this.context.getStore()?.parent ?? this.lastExecuteParent ?? {};
    const frames = encodeFrames(server.connInfo.key, {
      header: makeHeader(msgType, this.session),
      parent,
      metadata: options.metadata ?? {},
      content,
      buffers: (options.buffers ?? []).map(toBuffer),
    });
    this.sender(server.iopub).send(frames);
  }

  /** Writes text to the output of the current request as an iopub stream. */
  writeStream(name: "stdout" | "stderr", text: string): void {
    if (text === "") return;
    this.publish("stream", { name, text });
  }

  /** True once the server has sockets to publish on. */
  get ready(): boolean {
    return this.server !== undefined;
  }

  /** Aborts the running cell's interrupt signal (each cell gets a fresh one when it starts). */
  interrupt(): void {
    this.interruptController.abort(new Error("interrupted by the user"));
  }

  /** Entry point replacing ZmqServer.prototype.handleShellMessage(sock, ...frames). */
  async handleFrames(server: TslabServer, socket: SendingSocket, frames: Buffer[]): Promise<void> {
    this.server = server;
    let message: WireMessage;
    try {
      message = parseFrames(server.connInfo.key, frames, this.signatures);
    } catch (error) {
      this.log(`dropped a message: ${(error as Error).message}`);
      return;
    }
    const parent = message.header;
    const status = (state: string) => this.context.run({ parent }, () => this.publish("status", { execution_state: state }));
    status("busy");
    try {
      await this.context.run({ parent }, () => this.dispatch(server, socket, message));
    } catch (error) {
      this.log(`${parent.msg_type} failed: ${(error as Error)?.stack ?? String(error)}`);
    } finally {
      status("idle");
    }
  }

  private reply(socket: SendingSocket, request: WireMessage, msgType: string, content: Record<string, unknown>, metadata: Record<string, unknown> = {}): void {
    const frames = encodeFrames(this.server!.connInfo.key, {
      identities: request.identities,
      header: makeHeader(msgType, this.session),
      parent: request.header,
      metadata,
      content,
    });
    this.sender(socket).send(frames);
  }

  private sender(socket: SendingSocket): SerialSender {
    let sender = this.senders.get(socket);
    if (!sender) {
      sender = new SerialSender(socket, (error) => this.log(`send failed: ${String(error)}`));
      this.senders.set(socket, sender);
    }
    return sender;
  }

  private async dispatch(server: TslabServer, socket: SendingSocket, message: WireMessage): Promise<void> {
    const content = message.content;
    const buffers = message.buffers.map((b) => new DataView(b.buffer, b.byteOffset, b.byteLength));
    const type = message.header.msg_type;
    const replyType = type.replace(/_request$/, "_reply");
    const safeReply = (compute: () => Record<string, unknown>) => {
      try {
        this.reply(socket, message, replyType, compute());
      } catch (error) {
        this.reply(socket, message, replyType, { status: "error", ...errorContentOf(error) });
      }
    };
    switch (type) {
      case "kernel_info_request":
        return safeReply(() => this.kernelInfo(server));
      case "execute_request":
        return this.enqueueExecute(socket, message);
      case "is_complete_request":
        return safeReply(() => checkCompleteness(String(content.code ?? ""), this.tslab.converter.isCompleteCode, this.tslab.typescript as unknown as TranspileApi));
      case "complete_request":
        return safeReply(() => server.handler.handleComplete(content));
      case "inspect_request":
        return safeReply(() => server.handler.handleInspect(content));
      case "history_request":
        return safeReply(() => ({ status: "ok", history: [] }));
      case "comm_info_request":
        return safeReply(() => this.comms.info(typeof content.target_name === "string" ? content.target_name : undefined));
      case "comm_open":
        return this.runCommHandler(() => this.comms.handleOpen(content, buffers, message.metadata));
      case "comm_msg":
        return this.runCommHandler(() => this.comms.handleMessage(content, buffers, message.metadata));
      case "comm_close":
        return this.runCommHandler(async () => this.comms.handleClose(content));
      case "interrupt_request":
        this.interruptAll(server);
        return safeReply(() => ({ status: "ok" }));
      case "shutdown_request":
        safeReply(() => ({ status: "ok", restart: Boolean(content.restart) }));
        return this.shutdown(server);
      default:
        this.log(`unsupported message type ${JSON.stringify(type)} ignored`);
    }
  }

  private kernelInfo(server: TslabServer): Record<string, unknown> {
    const base = server.handler.handleKernel();
    const languageInfo = { ...(base.language_info as Record<string, unknown>), version: this.tslab.typescript.version };
    return {
      ...base,
      status: "ok",
      protocol_version: "5.3",
      implementation: this.identity.implementation,
      implementation_version: this.identity.implementationVersion,
      language_info: languageInfo,
      banner: `TypeScript ${this.tslab.typescript.version} (fringekit ${this.identity.implementationVersion} on tslab ${this.tslab.version}, Node ${process.version})`,
      help_links: [],
    };
  }

  /** Runs a comm handler; its failure is shown as stderr output under the comm message. */
  private async runCommHandler(run: () => Promise<void>): Promise<void> {
    try {
      await run();
    } catch (error) {
      const { ename, evalue } = errorContentOf(error);
      this.writeStream("stderr", `comm handler failed: ${ename}: ${evalue}\n`);
      this.log(`comm handler failed: ${(error as Error)?.stack ?? String(error)}`);
    }
  }

  private enqueueExecute(socket: SendingSocket, message: WireMessage): Promise<void> {
    // Cells run one after another; a failed cell does not cancel the next (unlike tslab).
    const run = this.executionQueue.then(() => this.execute(socket, message));
    this.executionQueue = run.catch(() => undefined);
    return run;
  }

  private async execute(socket: SendingSocket, message: WireMessage): Promise<void> {
    const { content } = message;
    const code = typeof content.code === "string" ? content.code : "";
    const silent = content.silent === true;
    const storeHistory = content.store_history === undefined ? !silent : content.store_history === true;
    if (storeHistory && !silent) this.executionCount += 1;
    const count = this.executionCount;
    this.lastExecuteParent = message.header;
    if (!silent) this.publish("execute_input", { code, execution_count: count });
    this.interruptController = new AbortController();

    const capture: Capture = { errors: [] };
    this.capture = capture;
    let ok = false;
    try {
      ok = await this.server!.handler.executor.execute(code);
    } catch (error) {
      capture.errors.push([error]);
    } finally {
      this.capture = undefined;
    }

    if (ok && capture.errors.length === 0) {
      if (capture.value && !silent) {
        const bundle = this.bundleFor(capture.value.v);
        this.publish("execute_result", { execution_count: count, data: bundle.data, metadata: bundle.metadata });
      }
      this.reply(socket, message, "execute_reply", { status: "ok", execution_count: count, payload: [], user_expressions: {} });
      return;
    }
    const error: ErrorContent = errorContentFrom(capture.errors);
    if (!silent) this.publish("error", { ...error });
    this.reply(socket, message, "execute_reply", { status: "error", execution_count: count, ...error }, { status: "error" });
  }

  private bundleFor(value: unknown): { data: Record<string, unknown>; metadata: Record<string, unknown> } {
    try {
      return mimeBundleOf(value);
    } catch (error) {
      this.writeStream("stderr", `${(error as Error).message}; showing plain text\n`);
      return { data: { "text/plain": plainText(value) }, metadata: {} };
    }
  }

  private interruptAll(server: TslabServer): void {
    this.interrupt();
    server.handler.executor.interrupt();
  }

  private shutdown(server: TslabServer): void {
    // Let the reply and idle status leave before the sockets close.
    setTimeout(() => {
      try {
        server.close();
      } finally {
        setTimeout(() => process.exit(0), 100);
      }
    }, 100);
  }
}
