// The job on paper: the machine's name (typed once, kept on the device) and today's date in
// every print head.
import { device } from "./store.js";

const KEY = "sumpside.machine";
const input = document.querySelector("[data-job=machine]");

export const machineName = () => input.value.trim();

function showMachine() {
  for (const span of document.querySelectorAll("[data-job-show=machine]")) span.textContent = input.value || "________________";
}

export function startJob() {
  input.value = device.get(KEY, "");
  input.addEventListener("input", () => { device.set(KEY, input.value); showMachine(); });
  for (const span of document.querySelectorAll("[data-today]")) span.textContent = new Date().toLocaleDateString();
  showMachine();
}
