import { ApiRequestError, networkFailureStatus, parseApiError } from './api-client';

/** How far an upload has got: bytes sent of the total (total 0 while unknown). */
export type UploadProgress = { sentBytes: number; totalBytes: number };

/**
 * POST a multipart form to `/api/...` and report upload progress. fetch() cannot report how much of
 * a request body has gone out, XMLHttpRequest can, hence this one exception to api-client.ts.
 * Errors are the same ApiRequestError as everywhere else (the server's message and fields).
 */
export function uploadWithProgress<Result>(
  path: string,
  form: FormData,
  onProgress: (progress: UploadProgress) => void,
  signal?: AbortSignal,
): Promise<Result> {
  return new Promise((resolve, reject) => {
    const request = new XMLHttpRequest();
    request.open('POST', path);
    request.withCredentials = true;
    request.setRequestHeader('Accept', 'application/json');
    request.upload.onprogress = (event) => onProgress({ sentBytes: event.loaded, totalBytes: event.lengthComputable ? event.total : 0 });
    request.onload = () => {
      let body: unknown;
      try {
        body = request.responseText === '' ? undefined : JSON.parse(request.responseText);
      } catch {
        body = undefined;
      }
      if (request.status >= 200 && request.status < 300) resolve(body as Result);
      else reject(parseApiError(request.status, body));
    };
    request.onerror = () =>
      reject(new ApiRequestError(networkFailureStatus, 'The upload did not reach the Rejectra server. Check that it is running and the network is up.'));
    request.onabort = () => reject(new DOMException('Upload cancelled', 'AbortError'));
    signal?.addEventListener('abort', () => request.abort(), { once: true });
    request.send(form);
  });
}
