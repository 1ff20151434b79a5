# An image for running heathours shards and merges on a cluster (README: "running on a cluster").
# Node 20 on Debian, the repository, its npm dependencies; no browser (the tests are not run here).
FROM node:20-bookworm-slim
WORKDIR /opt/heathours
# Dependencies first (a layer kept while only the sources change), then the sources and the
# compile step that `npm ci` would run through `prepare` (the command runs compiled JavaScript).
COPY package.json package-lock.json ./
RUN npm ci --no-audit --no-fund --ignore-scripts
COPY . .
RUN npm run compile
ENV ASTRO_TELEMETRY_DISABLED=1
ENTRYPOINT []
