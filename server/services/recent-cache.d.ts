export declare function createRecentCache<V>(ttlMs: number, maxEntries?: number): {
    get: (key: string) => V | undefined;
    set: (key: string, value: V) => void;
    forget: (key: string) => undefined;
    clear: () => void;
};
