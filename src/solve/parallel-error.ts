/**
 * Errors across a thread boundary: a worker's error as plain data, and back into
 * the error the serial path would have thrown (a StackwrightError keeps its
 * message, kind and where, so the CLI prints the same line and exit status).
 */
import { StackwrightError, type ErrorKind } from '../errors.js';

export interface WireError {
  /** Set for a StackwrightError. */
  kind?: ErrorKind;
  where?: string;
  name: string;
  message: string;
  stack?: string;
}

export function toWire(e: unknown): WireError {
  if (e instanceof StackwrightError) return { kind: e.kind, where: e.where, name: e.name, message: e.message, stack: e.stack };
  if (e instanceof Error) return { name: e.name, message: e.message, stack: e.stack };
  return { name: 'Error', message: String(e) };
}

export function fromWire(w: WireError): Error {
  if (w.kind !== undefined) {
    // The constructor puts `where: ` before the message; the wire carries the whole message.
    const prefix = w.where ? `${w.where}: ` : '';
    const base = prefix && w.message.startsWith(prefix) ? w.message.slice(prefix.length) : w.message;
    const e = new StackwrightError(base, { kind: w.kind, where: w.where });
    if (e.message !== w.message) e.message = w.message;
    if (w.stack) e.stack = w.stack;
    return e;
  }
  const e = new Error(w.message);
  e.name = w.name;
  if (w.stack) e.stack = w.stack;
  return e;
}
