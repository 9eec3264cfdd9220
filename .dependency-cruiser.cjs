// The layering of DEVELOPERS.md ("Architecture"), checked by dependency-cruiser on every
// `npm test` (a step of docker-free-scripts/test.sh) and by `npm run lint:deps`.
// Every exception is written next to the rule it bends, with the reason; there are no others.

/** @type {import('dependency-cruiser').IConfiguration} */
module.exports = {
  forbidden: [
    {
      name: 'no-cycles',
      severity: 'error',
      comment: 'A cycle ties two modules into one: neither can be read, tested or moved alone.',
      from: {},
      to: { circular: true },
    },
    {
      name: 'shared-is-self-contained',
      severity: 'error',
      comment:
        'shared/ runs in the browser and in Node: it never reaches into the client, the server or the tests.',
      from: { path: '^shared/' },
      to: { path: '^(src|server|tests)/' },
    },
    {
      name: 'shared-uses-no-node-builtins',
      severity: 'error',
      comment: 'shared/ runs in the browser too: no Node built-in modules.',
      from: { path: '^shared/' },
      to: { dependencyTypes: ['core'] },
    },
    {
      name: 'flow-imports-nothing-outside',
      severity: 'error',
      comment: 'The flow engine is pure TypeScript over its own types: it imports nothing but itself.',
      from: { path: '^shared/flow/' },
      to: { pathNot: '^shared/flow/' },
    },
    {
      name: 'geo-imports-geo-model-and-contract-types',
      severity: 'error',
      comment:
        'shared/geo turns road files into nodes and segments. It may use turf, geojson types, the planning model ' +
        '(shared/model) and the contract (shared/api), never the flow engine nor anything outside shared/. ' +
        'Why the contract: what geo produces (segment, zone and shelter attributes, the import report, bad ' +
        'features) IS the contract of the upload routes, and geo validates the attributes it reads with the ' +
        'same zod schemas the routes use (shared/api/road-attributes.ts and siblings), so a file and a form ' +
        'are refused for the same reasons. Copying those types into geo would make two definitions to keep equal.',
      from: { path: '^shared/geo/' },
      to: {
        pathNot: ['^shared/(geo|model|api)/', '^node_modules/(@turf|zod|@types/geojson)/'],
      },
    },
    {
      name: 'model-imports-model-flow-geo-contract',
      severity: 'error',
      comment:
        'shared/model (capacities, departure curves, the engine problem, scenario overlays and the ' +
        'logic of results) builds on the engine, geometry and the contract, and on zod only.',
      from: { path: '^shared/model/' },
      to: { pathNot: ['^shared/(model|flow|geo|api)/', '^node_modules/zod/'] },
    },
    {
      name: 'contract-imports-contract-and-zod',
      severity: 'error',
      comment:
        'shared/api is the contract: zod schemas and the types inferred from them, plus the small ' +
        'vocabularies they are made of. It may read the model and the engine for shared constants and types.',
      from: { path: '^shared/api/' },
      to: { pathNot: ['^shared/(api|model|flow)/', '^node_modules/zod/'] },
    },
    {
      name: 'server-never-imports-client',
      severity: 'error',
      comment: 'The server and the client share only shared/.',
      from: { path: '^server/' },
      to: { path: '^(src|tests)/' },
    },
    {
      name: 'client-never-imports-server',
      severity: 'error',
      comment: 'The client and the server share only shared/.',
      from: { path: '^src/' },
      to: { path: '^(server|tests)/' },
    },
    {
      name: 'db-never-imports-upwards',
      severity: 'error',
      comment: 'server/db is the bottom layer: schema and client. It knows nothing of services, routes or workers.',
      from: { path: '^server/db/' },
      to: { path: '^server/(routes|services|runs|queue|middleware|auth|briefings|import|cli|seed)/' },
    },
    {
      name: 'services-never-import-routes-or-middleware',
      severity: 'error',
      comment:
        'routes → services → db, with no way back: a service never knows it is called over HTTP. ' +
        'Errors are HttpErrors from server/errors.ts; only the error handler turns them into answers.',
      from: { path: '^server/services/' },
      to: { path: '^server/(routes|middleware|auth|http)/' },
    },
    {
      name: 'auth-glue-is-above-services',
      severity: 'error',
      comment:
        'server/auth is the sign-in glue (passport, the session store): it calls services; services never call it. ' +
        'The password hash and the user caches that services use live in server/services.',
      from: { path: '^server/auth/' },
      to: { path: '^server/(routes|middleware|http)/' },
    },
    {
      name: 'routes-never-touch-the-database',
      severity: 'error',
      comment:
        'Routes are thin: parse, call one service, respond. The database is reached through services. ' +
        'Exception, by design: a router factory receives the database handle (its type, `import type { Database }` ' +
        'or `import type pg`) to hand it to the services it calls; a type-only import cannot query, so it is allowed.',
      from: { path: '^server/routes/' },
      to: { path: ['^server/db/', '^node_modules/(drizzle-orm|pg)/'], dependencyTypesNot: ['type-only'] },
    },
    {
      name: 'routes-are-only-mounted-by-the-app',
      severity: 'error',
      comment: 'A router is mounted by server/app.ts; nothing else imports one (shared HTTP helpers live in server/http).',
      from: { path: '^server/', pathNot: ['^server/app\\.ts$', '^server/routes/'] },
      to: { path: '^server/routes/' },
    },
    {
      name: 'workers-never-import-http',
      severity: 'error',
      comment: 'Worker execution (server/run-execution) runs without HTTP: no routes, middleware or HTTP helpers.',
      from: { path: '^server/run-execution/' },
      to: { path: '^server/(routes|middleware|http|auth)/' },
    },
    {
      name: 'views-and-components-reach-the-api-through-stores',
      severity: 'error',
      comment:
        'Components and views reach the API only through Pinia stores (src/stores) or composables ' +
        '(src/composables), so one place owns each piece of server state.',
      // Allowed: src/api/api-error.ts, the class a failed request throws (read for its status or field
      // errors); it calls nothing.
      from: { path: '^src/(components|views)/' },
      to: { path: '^src/api/', pathNot: ['^src/api/api-error\\.ts$'] },
    },
    {
      name: 'map-helpers-are-leaf-modules',
      severity: 'error',
      comment:
        'src/map holds Leaflet helpers and map looks: it uses shared/ and itself, never forms, stores, the API or components.',
      from: { path: '^src/map/' },
      to: { path: '^src/(forms|stores|api|components|views|composables)/' },
    },
    {
      name: 'stores-and-composables-never-import-components',
      severity: 'error',
      comment: 'State and logic sit below the components that show them.',
      from: { path: '^src/(stores|composables|api|format|forms|map)/' },
      to: { path: '^src/(components|views)/' },
    },
    {
      name: 'not-to-unresolvable',
      severity: 'error',
      comment: 'An import that resolves to nothing is a typo or a missing package.',
      from: {},
      to: { couldNotResolve: true },
    },
  ],
  options: {
    doNotFollow: { path: 'node_modules' },
    exclude: { path: '(^|/)node_modules/\\.tmp/' },
    tsPreCompilationDeps: true,
    combinedDependencies: false,
    tsConfig: { fileName: 'tsconfig.json' },
    webpackConfig: { fileName: '.dependency-cruiser-aliases.cjs' },
    enhancedResolveOptions: {
      exportsFields: ['exports'],
      conditionNames: ['import', 'require', 'node', 'default', 'types'],
      extensions: ['.ts', '.vue', '.mjs', '.js', '.json', '.d.ts'],
      mainFields: ['module', 'main', 'types', 'typings'],
    },
    moduleSystems: ['es6', 'cjs'],
  },
};
