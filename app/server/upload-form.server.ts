/**
 * Reads a form that may carry one file, with a size cap enforced while the
 * body streams in, so an oversized upload is refused before it is buffered whole.
 */
import { MaxFileSizeExceededError, MaxTotalSizeExceededError, parseFormData } from "@remix-run/form-data-parser";

export type UploadForm = { formData: FormData; file: File | null; tooLarge: boolean };

export async function readUploadForm(request: Request, fileField: string, maxBytes: number): Promise<UploadForm> {
  try {
    const formData = await parseFormData(request, { maxFileSize: maxBytes, maxFiles: 1 });
    const value = formData.get(fileField);
    const file = value instanceof File && value.size > 0 ? value : null;
    return { formData, file, tooLarge: false };
  } catch (error) {
    if (error instanceof MaxFileSizeExceededError || error instanceof MaxTotalSizeExceededError) {
      return { formData: new FormData(), file: null, tooLarge: true };
    }
    throw error;
  }
}
