/** @type {import('next').NextConfig} */
const nextConfig = {
  // PGlite breaks when bundled; a second bundled copy of yjs warns "Yjs was already imported".
  serverExternalPackages: ['@electric-sql/pglite', 'yjs'],
  poweredByHeader: false,
  reactStrictMode: true,
};
export default nextConfig;
