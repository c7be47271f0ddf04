// Browser uploads with real progress: fetch cannot report upload progress, XMLHttpRequest can.
export interface UploadAnswer<T> {
  status: number;
  body: T | { error: { code: string; message: string; line?: number } };
}

export function uploadWithProgress<T>(url: string, form: FormData, onProgress: (fraction: number) => void): Promise<UploadAnswer<T>> {
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open("POST", url);
    xhr.responseType = "json";
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable) onProgress(e.loaded / e.total);
    };
    xhr.onload = () => resolve({ status: xhr.status, body: xhr.response ?? { error: { code: "internal", message: `The server answered ${xhr.status}.` } } });
    xhr.onerror = () => reject(new Error("The upload did not reach the server (network error)."));
    xhr.send(form);
  });
}
