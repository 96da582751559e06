// Downloads and uploads with progress, for the Hand-over screen: a download is read from the
// response stream (a known total when the server sends Content-Length, else indeterminate) and
// saved through a temporary link; an upload goes through XMLHttpRequest, whose upload events
// report the bytes sent (fetch cannot).
import { ApiError } from './api.ts';

export interface Progress {
  loaded: number;
  /** null when the server did not say how large the file is. */
  total: number | null;
}

async function errorOf(response: Response): Promise<ApiError> {
  let message = `The server answered ${response.status}.`;
  let code = `http-${response.status}`;
  try {
    const body = (await response.json()) as { error?: { code?: string; message?: string } };
    if (body.error?.message) message = body.error.message;
    if (body.error?.code) code = body.error.code;
  } catch {
    /* not JSON: keep the status line */
  }
  if (response.status === 404 && code === `http-404`) message = 'This export is not available on the server yet.';
  return new ApiError(response.status, code, message);
}

function filenameOf(response: Response, fallback: string): string {
  const cd = response.headers.get('content-disposition') ?? '';
  const star = /filename\*=UTF-8''([^;]+)/i.exec(cd);
  if (star) return decodeURIComponent(star[1]!);
  const plain = /filename="?([^";]+)"?/i.exec(cd);
  return plain ? plain[1]! : fallback;
}

/** Fetches /api{path}, reports progress while reading, and saves the result as a file. */
export async function downloadFile(path: string, fallbackName: string, onProgress: (p: Progress) => void, signal?: AbortSignal): Promise<{ name: string; bytes: number }> {
  let response: Response;
  try {
    response = await fetch(`/api${path}`, { credentials: 'same-origin', signal });
  } catch (err) {
    if ((err as Error).name === 'AbortError') throw err;
    throw new ApiError(0, 'offline', 'The server cannot be reached. Check the connection and try again.');
  }
  if (!response.ok) throw await errorOf(response);
  const length = Number(response.headers.get('content-length'));
  const total = Number.isFinite(length) && length > 0 ? length : null;
  const chunks: BlobPart[] = [];
  let loaded = 0;
  onProgress({ loaded, total });
  if (response.body) {
    const reader = response.body.getReader();
    for (;;) {
      const { done, value } = await reader.read();
      if (done) break;
      chunks.push(value as Uint8Array<ArrayBuffer>);
      loaded += value.byteLength;
      onProgress({ loaded, total });
    }
  } else {
    const buf = await response.arrayBuffer();
    chunks.push(buf);
    loaded = buf.byteLength;
    onProgress({ loaded, total });
  }
  const name = filenameOf(response, fallbackName);
  const blob = new Blob(chunks, { type: response.headers.get('content-type') ?? 'application/octet-stream' });
  const url = URL.createObjectURL(blob);
  const a = document.createElement('a');
  a.href = url;
  a.download = name;
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 30_000);
  return { name, bytes: loaded };
}

/** Posts a file as multipart `file` to /api{path}, reporting the bytes sent. */
export function uploadFile<T>(path: string, file: File, onProgress: (p: Progress) => void): Promise<T> {
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open('POST', `/api${path}`);
    xhr.withCredentials = true;
    xhr.upload.onprogress = (e) => onProgress({ loaded: e.loaded, total: e.lengthComputable ? e.total : null });
    xhr.onerror = () => reject(new ApiError(0, 'offline', 'The upload did not reach the server. Check the connection; nothing was restored.'));
    xhr.onload = () => {
      let body: unknown;
      try {
        body = xhr.responseText ? JSON.parse(xhr.responseText) : undefined;
      } catch {
        body = undefined;
      }
      if (xhr.status >= 200 && xhr.status < 300) return resolve(body as T);
      const err = (body as { error?: { code?: string; message?: string } } | undefined)?.error;
      reject(new ApiError(xhr.status, err?.code ?? `http-${xhr.status}`, err?.message ?? (xhr.status === 404 ? 'Restoring is not available on the server yet.' : `The server answered ${xhr.status}.`)));
    };
    const form = new FormData();
    form.append('file', file);
    xhr.send(form);
  });
}

export function formatBytes(n: number): string {
  if (n < 1024) return `${n} B`;
  if (n < 1024 * 1024) return `${(n / 1024).toFixed(1)} KiB`;
  return `${(n / 1024 / 1024).toFixed(1)} MiB`;
}

/** Recipients typed with commas, semicolons or new lines; returns the addresses and the bad ones. */
export function parseRecipients(text: string): { valid: string[]; invalid: string[] } {
  const list = text
    .split(/[,;\n]+/)
    .map((s) => s.trim())
    .filter(Boolean);
  const email = /^[^\s@<>(),;:"]+@[^\s@<>(),;:"]+\.[^\s@<>(),;:"]{2,}$/;
  const valid = [...new Set(list.filter((s) => email.test(s)).map((s) => s.toLowerCase()))];
  return { valid, invalid: list.filter((s) => !email.test(s)) };
}
