/** @type {import('next').NextConfig} */
const nextConfig = {
  // A separate build folder lets two builds (e.g. two engineers' test runs) not collide.
  distDir: process.env.PLATEAU_NEXT_DIST || '.next',
  reactStrictMode: true,
  poweredByHeader: false,
  // Compression is the reverse proxy's job (docs/scale.md): gzip in the app cost about a third
  // of a millisecond of the one Node thread per answer under the load benchmark (docs/trust.md).
  compress: false,
  // Native and wasm packages stay outside the server bundle and load from node_modules.
  serverExternalPackages: ['better-sqlite3', '@prisma/adapter-better-sqlite3', 'pg', '@prisma/adapter-pg', '@node-rs/argon2', 'pdfkit'],
  experimental: { authInterrupts: true },
  typescript: { ignoreBuildErrors: false },
  async headers() {
    return [
      {
        source: '/:path*',
        headers: [
          { key: 'X-Content-Type-Options', value: 'nosniff' },
          { key: 'Referrer-Policy', value: 'same-origin' },
          { key: 'X-Frame-Options', value: 'DENY' },
          // The full Content-Security-Policy (nonce-based for pages) and HSTS come from proxy.ts
          // (lib/server/securityHeaders.ts); this baseline also covers static files.
          { key: 'Content-Security-Policy', value: "frame-ancestors 'none'; base-uri 'self'; form-action 'self'; object-src 'none'" },
          { key: 'Cross-Origin-Opener-Policy', value: 'same-origin' },
        ],
      },
    ];
  },
};
export default nextConfig;
