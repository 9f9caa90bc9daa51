/** Saves a blob under a file name through a temporary link (charts, stack files, result files). */
export function downloadBlob(blob: Blob, fileName: string): void {
  const url = URL.createObjectURL(blob);
  const a = document.createElement("a");
  a.href = url;
  a.download = fileName;
  document.body.appendChild(a);
  a.click();
  a.remove();
  // the browser has taken the file by then; the address is let go
  window.setTimeout(() => URL.revokeObjectURL(url), 1000);
}
