import type { ZodType, z } from 'zod';
import { ApiError } from '../../lib/api-client';
import { CsrfSchema } from '../../../shared/schemas/auth';
import type { ApiErrorBody } from '../../../shared/errors';

export type Progress = (fraction: number) => void;

/**
 * Sends a file as the request body and reports how much has gone. fetch cannot report upload
 * progress, so this one request goes through XMLHttpRequest, with the same error shape as the API client.
 */
export async function upload<S extends ZodType>(url: string, file: Blob, contentType: string, schema: S, onProgress?: Progress): Promise<z.infer<S>> {
  const token = CsrfSchema.parse(await (await fetch('/api/auth/csrf', { credentials: 'same-origin' })).json()).token;
  const { status, body } = await new Promise<{ status: number; body: unknown }>((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open('POST', url);
    xhr.setRequestHeader('content-type', contentType);
    xhr.setRequestHeader('accept', 'application/json');
    xhr.setRequestHeader('x-csrf-token', token);
    xhr.responseType = 'json';
    xhr.upload.onprogress = (e) => e.lengthComputable && onProgress?.(e.loaded / e.total);
    xhr.onload = () => resolve({ status: xhr.status, body: xhr.response });
    xhr.onerror = () => reject(new ApiError(0, 'network', 'Lashline cannot be reached. Check the connection and send the file again.'));
    xhr.send(file);
  });
  if (status < 200 || status >= 300) {
    const err = (body as ApiErrorBody | null)?.error;
    throw new ApiError(status, err?.code ?? 'internal', err?.message ?? `The server answered ${status}.`, err?.details);
  }
  onProgress?.(1);
  return schema.parse(body);
}
