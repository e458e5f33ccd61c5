// Lit components (one per file, named after its tag) and the helper modules they share; loading
// this registers <seedfall-app> and the elements it uses. The public face of app/ui/: app/main.ts
// imports from here only.
export { SeedfallApp } from './seedfall-app';
export { offerAppUpdate } from './pwa-update';
