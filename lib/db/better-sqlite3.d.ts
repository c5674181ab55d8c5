// The small part of better-sqlite3's API that the verify reader and backups use (the package ships no types).
declare module "better-sqlite3" {
  namespace Database {
    interface Statement {
      all(...params: unknown[]): unknown[];
      run(...params: unknown[]): { changes: number };
      get(...params: unknown[]): unknown;
      iterate(...params: unknown[]): IterableIterator<unknown>;
      pluck(on?: boolean): Statement;
    }
    interface Database {
      prepare(sql: string): Statement;
      exec(sql: string): Database;
      close(): void;
      /** SQLite's online backup API: copies the database to a file while others keep writing */
      backup(destination: string, options?: { progress?: (p: { totalPages: number; remainingPages: number }) => number }): Promise<{ totalPages: number; remainingPages: number }>;
    }
  }
  interface DatabaseConstructor {
    new (file: string, options?: { readonly?: boolean; fileMustExist?: boolean }): Database.Database;
  }
  const Database: DatabaseConstructor;
  export = Database;
}
