"use client";
// Uploads with progress. fetch() can't report upload progress in browsers yet, so one file
// goes up per XMLHttpRequest and its progress events drive that file's bar.

/** status: the HTTP status of a refusal, 0 when no answer came (the outbox retries those). */
export type UploadResult<T> = { ok: true; data: T } | { ok: false; message: string; status: number };

export function uploadFile<T>(url: string, field: string, file: File, onProgress: (fraction: number) => void, signal?: AbortSignal): Promise<UploadResult<T>> {
  return new Promise((resolve) => {
    const xhr = new XMLHttpRequest();
    xhr.open("POST", url);
    xhr.responseType = "json";
    xhr.setRequestHeader("accept", "application/json");
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable) onProgress(e.loaded / e.total);
    };
    xhr.onload = () => {
      const body = xhr.response as { error?: { message?: string } } | null;
      if (xhr.status >= 200 && xhr.status < 300) resolve({ ok: true, data: body as T });
      else resolve({ ok: false, message: body?.error?.message ?? `Upload failed (${xhr.status}).`, status: xhr.status });
    };
    xhr.onerror = () => resolve({ ok: false, message: "The connection dropped. Check the Wi-Fi and try again.", status: 0 });
    xhr.onabort = () => resolve({ ok: false, message: "Upload cancelled.", status: 0 });
    signal?.addEventListener("abort", () => xhr.abort());
    const form = new FormData();
    form.append(field, file);
    xhr.send(form);
  });
}

/** Runs tasks with at most `limit` at once (a phone on garage Wi-Fi does better with few). */
export async function runLimited(tasks: (() => Promise<void>)[], limit: number): Promise<void> {
  let next = 0;
  const worker = async () => {
    for (let task = tasks[next++]; task; task = tasks[next++]) await task();
  };
  await Promise.all(Array.from({ length: Math.min(limit, tasks.length) }, worker));
}
