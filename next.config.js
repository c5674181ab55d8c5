/** @type {import('next').NextConfig} */
const nextConfig = {
  // Logger files are posted to a server action; the default 1 MB body limit is too small for a month of data.
  experimental: { serverActions: { bodySizeLimit: "50mb" } },
};

module.exports = nextConfig;
