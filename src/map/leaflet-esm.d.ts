// vue-leaflet (with useGlobalLeaflet false) builds its map from Leaflet's ES module build. Our
// layers must come from the same copy, so we import that file too; its types are Leaflet's.
declare module 'leaflet/dist/leaflet-src.esm' {
  export * from 'leaflet';
}
