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

// A file for the user to keep, offered as a download (nothing leaves the device).
export function download(name, type, text) {
  const url = URL.createObjectURL(new Blob([text], { type }));
  const a = Object.assign(document.createElement("a"), { href: url, download: name });
  document.body.append(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}
