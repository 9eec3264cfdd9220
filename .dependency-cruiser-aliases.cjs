// The import aliases of vite.config.ts and src/tsconfig.json, in the shape dependency-cruiser
// reads (a webpack-style `resolve.alias`; webpack itself is not used).
const path = require('node:path');
module.exports = {
  resolve: {
    alias: {
      '@shared': path.join(__dirname, 'shared'),
      '@': path.join(__dirname, 'src'),
    },
  },
};
