/** @type {import('next').NextConfig} */
const nextConfig = {
  // Logger files are posted to a server action; the default 1 MB body limit is too small for a month of data.
  experimental: { serverActions: { bodySizeLimit: "50mb" } },
  // The engine's worker pool loads its own worker file; keep piscina out of the server bundle.
  serverExternalPackages: ["piscina"],
};

module.exports = nextConfig;
