import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { SweepMode, SweepSummary } from '../../../../shared/schemas/sweeps';
import { uploadWithProgress, type UploadProgress } from '../../../lib/upload-with-progress';
import { sessionQueryKey } from './get-session';
import { sessionsQueryKey } from './get-sessions';

export type CaptureTag = { file: string; mode: SweepMode; frequencyHz: number | null };

export type UploadCapturesVariables = {
  sessionId: string;
  files: File[];
  tags: CaptureTag[];
  /** Volts per full scale for WAV captures (input and output channel); null leaves the server default. */
  inputVoltsPerFullScale: number | null;
  outputVoltsPerFullScale: number | null;
  onProgress: (progress: UploadProgress) => void;
};

/** Upload many two-channel captures; the server fits each one and adds a point per capture. */
export function uploadCaptures({ sessionId, files, tags, inputVoltsPerFullScale, outputVoltsPerFullScale, onProgress }: UploadCapturesVariables): Promise<{ sweeps: SweepSummary[] }> {
  const form = new FormData();
  form.append('tags', JSON.stringify(tags));
  if (inputVoltsPerFullScale !== null) form.append('inputVoltsPerFullScale', String(inputVoltsPerFullScale));
  if (outputVoltsPerFullScale !== null) form.append('outputVoltsPerFullScale', String(outputVoltsPerFullScale));
  for (const file of files) form.append('files', file, file.name);
  return uploadWithProgress(`/api/sessions/${encodeURIComponent(sessionId)}/captures`, form, onProgress);
}

export function useUploadCaptures() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: uploadCaptures,
    onSuccess: (_result, { sessionId }) => {
      void queryClient.invalidateQueries({ queryKey: sessionQueryKey(sessionId) });
      void queryClient.invalidateQueries({ queryKey: [...sessionsQueryKey, 'list'] });
    },
  });
}
