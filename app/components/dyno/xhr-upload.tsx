// A multipart POST with upload progress (fetch cannot report it; XMLHttpRequest can).
export function uploadWithProgress<T>(
  url: string,
  body: FormData,
  onProgress: (fraction: number) => void,
): Promise<{ status: number; json: T | null }> {
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open("POST", url);
    xhr.setRequestHeader("Accept", "application/json");
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable && e.total > 0) onProgress(e.loaded / e.total);
    };
    xhr.onload = () => {
      let json: T | null = null;
      try {
        json = JSON.parse(xhr.responseText) as T;
      } catch {
        json = null;
      }
      resolve({ status: xhr.status, json });
    };
    xhr.onerror = () =>
      reject(new Error("The upload was cut off; check the connection and try again."));
    xhr.send(body);
  });
}

export function UploadProgress({ fraction, label }: { fraction: number; label: string }) {
  const pct = Math.round(fraction * 100);
  return (
    <div className="mt-2" role="status">
      <label className="block text-sm text-graphite" htmlFor="upload-progress">
        {label}: {pct} %
      </label>
      <progress id="upload-progress" className="h-2 w-full accent-teal" max={100} value={pct}>
        {pct} %
      </progress>
    </div>
  );
}
