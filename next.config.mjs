/** @type {import('next').NextConfig} */
const nextConfig = {
  // PGlite breaks when bundled; a second bundled copy of yjs warns "Yjs was already imported".
  serverExternalPackages: ['@electric-sql/pglite', 'yjs'],
  // A separate build folder lets parallel work trees (or a benchmark) build without clobbering .next.
  distDir: process.env.MARGINALIA_DIST_DIR || '.next',
  poweredByHeader: false,
  reactStrictMode: true,
};
export default nextConfig;
