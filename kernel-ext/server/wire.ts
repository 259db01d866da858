/**
 * Jupyter wire protocol (messaging spec 5.3, "The Wire Protocol"): frames are
 * [identities..., "<IDS|MSG>", HMAC-SHA256 hex, header, parent_header, metadata, content,
 * buffers...]. The HMAC covers exactly the four JSON frames (header, parent_header, metadata,
 * content), never the buffers, which travel as raw bytes. tslab signs its extra frames as JSON
 * text, so binary buffers break its HMAC; the extension parses and signs messages itself.
 */
import { createHmac, randomUUID, timingSafeEqual } from "node:crypto";

const DELIMITER = Buffer.from("<IDS|MSG>");

/** A message header (spec 5.3). */
export interface MessageHeader {
  msg_id: string;
  session: string;
  username: string;
  date: string;
  msg_type: string;
  version: string;
  [key: string]: unknown;
}

/** A decoded message. */
export interface WireMessage {
  identities: Buffer[];
  header: MessageHeader;
  parent: Partial<MessageHeader>;
  metadata: Record<string, unknown>;
  content: Record<string, unknown>;
  buffers: Buffer[];
}

/** A frame sequence that is not a valid, correctly signed message. */
export class WireError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "WireError";
  }
}

/** HMAC-SHA256 hex signature of `parts` (the four JSON frames) with `key`; "" when the key is empty (signing off). */
export function sign(key: string, parts: readonly Uint8Array[]): string {
  if (key === "") return "";
  const hmac = createHmac("sha256", key);
  for (const part of parts) hmac.update(part);
  return hmac.digest("hex");
}

/**
 * Signatures already accepted, so a captured signed message cannot be sent again (as Jupyter's
 * reference kernel does). Bounded: past `capacity` entries the oldest is forgotten.
 */
export class SignatureHistory {
  private readonly seen = new Set<string>();
  /** @param capacity how many signatures are remembered (default 65 536) */
  constructor(private readonly capacity = 2 ** 16) {}
  /** Number of remembered signatures. */
  get size(): number {
    return this.seen.size;
  }
  /** Remembers `signature`; false when it was already there (a replay). */
  add(signature: string): boolean {
    if (this.seen.has(signature)) return false;
    this.seen.add(signature);
    if (this.seen.size > this.capacity) this.seen.delete(this.seen.values().next().value as string);
    return true;
  }
}

/**
 * Decodes and verifies frames; throws WireError naming the problem. With `history`, a message
 * whose (valid) signature was seen before is refused as a replay.
 */
export function parseFrames(key: string, frames: readonly Buffer[], history?: SignatureHistory): WireMessage {
  const delimiterAt = frames.findIndex((frame) => frame.equals(DELIMITER));
  if (delimiterAt < 0) throw new WireError("message without <IDS|MSG> delimiter");
  if (frames.length < delimiterAt + 6) throw new WireError(`message with ${frames.length - delimiterAt - 1} frames after the delimiter (need 5)`);
  const signature = frames[delimiterAt + 1].toString("ascii");
  const parts = frames.slice(delimiterAt + 2);
  const expected = sign(key, parts.slice(0, 4));
  if (key !== "") {
    const got = Buffer.from(signature, "ascii");
    const want = Buffer.from(expected, "ascii");
    if (got.length !== want.length || !timingSafeEqual(got, want)) throw new WireError("message with a wrong HMAC signature");
    if (history && !history.add(signature)) throw new WireError("replayed message: its signature was already used");
  }
  const json = (index: number, name: string): Record<string, unknown> => {
    let value: unknown;
    try {
      value = JSON.parse(parts[index].toString("utf8"));
    } catch (error) {
      throw new WireError(`${name} frame is not JSON: ${(error as Error).message}`);
    }
    if (value === null || typeof value !== "object" || Array.isArray(value)) throw new WireError(`${name} frame is not a JSON object`);
    return value as Record<string, unknown>;
  };
  const header = json(0, "header");
  if (typeof header.msg_type !== "string" || typeof header.msg_id !== "string") {
    throw new WireError("header without string msg_type and msg_id");
  }
  return {
    identities: frames.slice(0, delimiterAt),
    header: header as MessageHeader,
    parent: json(1, "parent_header"),
    metadata: json(2, "metadata"),
    content: json(3, "content"),
    buffers: parts.slice(4),
  };
}

/** A fresh header for a kernel-sent message. */
export function makeHeader(msgType: string, session: string): MessageHeader {
  return {
    msg_id: randomUUID(),
    session,
    username: "kernel",
    date: new Date().toISOString(),
    msg_type: msgType,
    version: "5.3",
  };
}

/** Encodes and signs a message as frames. */
export function encodeFrames(
  key: string,
  message: { identities?: readonly Buffer[]; header: MessageHeader; parent: Partial<MessageHeader> | Record<string, never>; metadata?: Record<string, unknown>; content: Record<string, unknown>; buffers?: readonly Buffer[] },
): Buffer[] {
  const parts = [
    Buffer.from(JSON.stringify(message.header)),
    Buffer.from(JSON.stringify(message.parent ?? {})),
    Buffer.from(JSON.stringify(message.metadata ?? {})),
    Buffer.from(JSON.stringify(message.content)),
    ...(message.buffers ?? []),
  ];
  return [...(message.identities ?? []), DELIMITER, Buffer.from(sign(key, parts.slice(0, 4))), ...parts];
}

/** The part of a zeromq socket the sender needs. */
export interface SendingSocket {
  send(frames: Buffer[]): Promise<void>;
}

/**
 * Sends frames on one socket in order. A zeromq socket allows one pending send at a time
 * (EBUSY otherwise) but completes most sends synchronously, so a frame is sent at once when
 * nothing is queued — output printed by a cell that never yields (a busy loop) still leaves —
 * and otherwise waits its turn; bursts are neither lost nor reordered.
 */
export class SerialSender {
  private readonly queue: Buffer[][] = [];
  private last: Promise<unknown> = Promise.resolve();

  constructor(
    private readonly socket: SendingSocket,
    private readonly onError: (error: unknown) => void,
  ) {}

  /** Sends `frames` now if possible, else after the frames queued before them. Never throws. */
  send(frames: Buffer[]): void {
    if (this.queue.length === 0) {
      try {
        this.last = this.socket.send(frames).catch(this.onError);
        return;
      } catch (error) {
        if (!isBusy(error)) {
          this.onError(error);
          return;
        }
      }
    }
    this.queue.push(frames);
    if (this.queue.length === 1) void this.drain();
  }

  private async drain(): Promise<void> {
    while (this.queue.length > 0) {
      await this.last;
      try {
        this.last = this.socket.send(this.queue[0]).catch(this.onError);
      } catch (error) {
        if (isBusy(error)) continue;
        this.onError(error);
      }
      this.queue.shift();
    }
  }
}

function isBusy(error: unknown): boolean {
  return (error as { code?: string })?.code === "EBUSY";
}
