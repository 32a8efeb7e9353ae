import type { RecordVerification } from '#shared/types/record-proof'

/**
 * Verifies a record PDF in this browser with the same code as `npm run verify-record`: the file never
 * leaves the device and the answer does not rest on Chargewell's server. Loaded only when a file is
 * dropped (pdf.js and the WebAuthn checks are large).
 */
export async function verifyRecordHere(file: File): Promise<RecordVerification> {
  const [{ verifyRecordPdf, loadPdfJs }, { default: workerAddress }] = await Promise.all([
    import('#shared/utils/record-verify'),
    import('pdfjs-dist/legacy/build/pdf.worker.min.mjs?url'),
  ])
  const pdfjs = await loadPdfJs()
  pdfjs.GlobalWorkerOptions.workerSrc = workerAddress
  return verifyRecordPdf(new Uint8Array(await file.arrayBuffer()))
}
