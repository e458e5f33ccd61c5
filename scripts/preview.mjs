// Serves the built app (dist/) on localhost through vite's preview API; Ctrl+C stops it.
import { preview } from 'vite';

const port = Number(process.env.PORT ?? 4173);
const server = await preview({ preview: { port, strictPort: false, open: false } });
server.printUrls();
console.log('Seedfall is running with the demo plan. Press Ctrl+C to stop.');
const stop = async () => {
  await server.close();
  process.exit(0);
};
process.on('SIGINT', stop);
process.on('SIGTERM', stop);
