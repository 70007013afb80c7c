export const inputClass = 'block w-full min-h-touch rounded border border-steel-400 bg-white px-3 py-2 text-base';
