/** Saves what an address holds (a data: or blob: URL) under a file name, through a temporary link. */
export function downloadUrl(url: string, fileName: string): void {
  const a = document.createElement("a");
  a.href = url;
  a.download = fileName;
  document.body.appendChild(a);
  a.click();
  a.remove();
}

/** Saves a blob under a file name (charts, stack files, result files). */
export function downloadBlob(blob: Blob, fileName: string): void {
  const url = URL.createObjectURL(blob);
  downloadUrl(url, fileName);
  // the browser has taken the file by then; the address is let go
  window.setTimeout(() => URL.revokeObjectURL(url), 1000);
}
