/**
 * A proof handed over for checking: the PDF as the raw body, one file of a multipart/form-data upload (RFC 7578),
 * or JSON `{digest}` / `{pdfBase64}`. The body arrives as bytes (read only after sign-in, see read-body.ts).
 */
import { InvalidInputException } from '../../common/errors/domain.exception';
import type { VerifyInput } from './proofs.service';

/** The first file part of a multipart body, or the first part at all. */
export function fileFromMultipart(body: Buffer, contentType: string): Buffer | null {
  const boundary = /boundary=(?:"([^"]+)"|([^;\s]+))/i.exec(contentType);
  if (!boundary) return null;
  const delimiter = Buffer.from(`--${boundary[1] ?? boundary[2]}`, 'latin1');
  const parts: Buffer[] = [];
  let at = body.indexOf(delimiter);
  while (at !== -1) {
    const start = at + delimiter.length;
    if (body.subarray(start, start + 2).toString('latin1') === '--') break;
    const next = body.indexOf(delimiter, start);
    if (next === -1) break;
    parts.push(body.subarray(start + 2, next - 2)); // after CRLF, before CRLF
    at = next;
  }
  const split = parts.map((p) => {
    const end = p.indexOf('\r\n\r\n');
    return end === -1 ? null : { head: p.subarray(0, end).toString('latin1'), content: p.subarray(end + 4) };
  });
  const files = split.filter((p): p is { head: string; content: Buffer } => p !== null);
  return (files.find((p) => /filename=/i.test(p.head)) ?? files[0])?.content ?? null;
}

export function verifyInput(body: unknown, contentType: string | undefined, parseJson: (v: unknown) => { digest?: string; pdfBase64?: string }): VerifyInput {
  const type = (contentType ?? '').toLowerCase();
  if (Buffer.isBuffer(body) && type.startsWith('multipart/form-data')) {
    const file = fileFromMultipart(body, contentType!);
    if (!file) throw new InvalidInputException([{ code: 'proof.no_file', path: 'body.file', message: 'a multipart upload with the proof PDF as one of its parts' }]);
    return { pdf: file, field: 'body.file' };
  }
  if (Buffer.isBuffer(body)) return { pdf: body, field: 'body' };
  const json = parseJson(body ?? {});
  return json.pdfBase64 ? { pdf: Buffer.from(json.pdfBase64, 'base64'), field: 'body.pdfBase64' } : { digest: json.digest! };
}
