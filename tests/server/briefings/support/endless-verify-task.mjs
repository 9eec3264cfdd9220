// A stand-in for the verifier's task that never finishes, to show the time budget stops it.
export default function endless() {
  for (;;);
}
