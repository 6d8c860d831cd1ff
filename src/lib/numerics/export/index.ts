export * from './fitExport';
export { generatePython, generateTypeScript } from './codegen';
export { registerEmitter, registeredRepresentations, type CodeEmitter, type EmitContext } from './emitters';
