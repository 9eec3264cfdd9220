// Vuetify's component modules import their own .css files. The client project runs them as
// Node modules (the shared vite config does not inline Vuetify), and Node cannot load CSS, so
// a module hook answers every stylesheet with an empty module. Component tests call this first.
type Register = (specifier: string, parentUrl?: string) => void;

const hook = `
export async function load(url, context, next) {
  if (url.endsWith('.css')) return { format: 'module', source: '', shortCircuit: true };
  return next(url, context);
}`;

let registered = false;

export async function ignoreStylesheets(): Promise<void> {
  if (registered) return;
  const nodeModule = (await import(/* @vite-ignore */ 'node:module' as string)) as { register: Register };
  nodeModule.register(`data:text/javascript,${encodeURIComponent(hook)}`);
  registered = true;
}
