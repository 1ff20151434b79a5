# An image for running heathours shards and merges on a cluster (README: "running on a cluster").
# Node 20 on Debian, the repository, its npm dependencies; no browser (the tests are not run here).
FROM node:20-bookworm-slim
WORKDIR /opt/heathours
COPY package.json package-lock.json ./
RUN npm ci --no-audit --no-fund
COPY . .
ENV ASTRO_TELEMETRY_DISABLED=1
ENTRYPOINT []
