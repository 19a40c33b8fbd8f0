// Types of scripts/preload-web.mjs for the TypeScript that imports it (its test).
export function staticImports(code: string): string[];
export function dynamicImports(code: string): string[];
export function addPreloads(root: string): string[];
export function textFonts(css: string, family?: string): string[];
export function addFontPreloads(root: string): string[];
