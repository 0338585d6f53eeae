/**
 * Reads a multipart form with one uploaded file through the streaming form-data parser,
 * with limits. Over a limit, or a malformed body, answers with a message for the person
 * (UploadError), never a 500.
 */
import {
  FormDataParseError,
  MaxFileSizeExceededError,
  MaxFilesExceededError,
  MaxPartsExceededError,
  MaxTotalSizeExceededError,
  parseFormData,
  type FileUpload,
} from "@remix-run/form-data-parser";

export class UploadError extends Error {}

export type Upload = { form: FormData; file: { name: string; text: string } | null };

/**
 * @param maxFileBytes largest file accepted
 * @param fileField name of the file input
 */
export async function readUpload(request: Request, maxFileBytes: number, fileField = "file"): Promise<Upload> {
  const type = request.headers.get("Content-Type") ?? "";
  if (!type.startsWith("multipart/form-data")) {
    throw new UploadError("Send the form as a file upload (multipart/form-data).");
  }
  let file: Upload["file"] = null;
  const limitText =
    maxFileBytes >= 1024 * 1024 ? `${maxFileBytes / (1024 * 1024)} MB` : `${Math.round(maxFileBytes / 1024)} kB`;
  try {
    const form = await parseFormData(
      request,
      {
        maxFileSize: maxFileBytes,
        maxFiles: 1,
        maxParts: 50,
        maxTotalSize: maxFileBytes + 64 * 1024,
        maxHeaderSize: 8 * 1024,
      },
      async (upload: FileUpload) => {
        if (upload.fieldName !== fileField) return null;
        const bytes = new Uint8Array(await upload.arrayBuffer());
        let text: string;
        try {
          text = new TextDecoder("utf-8", { fatal: true }).decode(bytes);
        } catch {
          throw new UploadError("The file is not UTF-8 text. Save it as UTF-8 (or plain ASCII) and try again.");
        }
        file = { name: upload.name, text: text.replace(/^\uFEFF/, "") };
        return null;
      },
    );
    return { form, file };
  } catch (error) {
    if (error instanceof UploadError) throw error;
    if (error instanceof MaxFileSizeExceededError || error instanceof MaxTotalSizeExceededError) {
      throw new UploadError(`The file is larger than ${limitText}.`);
    }
    if (error instanceof MaxFilesExceededError) throw new UploadError("Upload one file at a time.");
    if (error instanceof MaxPartsExceededError) throw new UploadError("The form has too many fields.");
    if (error instanceof FormDataParseError || error instanceof Error) {
      throw new UploadError("The upload could not be read. Choose the file again and resend.");
    }
    throw error;
  }
}
