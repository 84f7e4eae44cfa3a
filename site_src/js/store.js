// Small JSON values kept on this device (localStorage) or for this tab (sessionStorage).
// A private mode or a full disk refuses to keep them: the page then works, remembering less.
function keeper(area) {
  return {
    get(key, fallback) {
      try { return JSON.parse(area().getItem(key)) ?? fallback; } catch { return fallback; }
    },
    set(key, value) {
      try { area().setItem(key, JSON.stringify(value)); } catch { /* not kept */ }
    },
  };
}

export const device = keeper(() => localStorage);
export const tab = keeper(() => sessionStorage);

// A file for the user to pass on: the phone's share sheet where the browser shares files
// (to another phone, a mail, a chat), else a download. Resolves with "shared", "cancelled"
// or "downloaded".
export async function share(name, type, text) {
  const file = typeof File === "function" ? new File([text], name, { type }) : null;
  if (file && navigator.canShare && navigator.canShare({ files: [file] })) {
    try {
      await navigator.share({ files: [file], title: name });
      return "shared";
    } catch (err) {
      if (err && err.name === "AbortError") return "cancelled";
    }
  }
  download(name, type, text);
  return "downloaded";
}

// A file for the user to keep, offered as a download (nothing leaves the device).
export function download(name, type, text) {
  const url = URL.createObjectURL(new Blob([text], { type }));
  const a = Object.assign(document.createElement("a"), { href: url, download: name });
  document.body.append(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}
