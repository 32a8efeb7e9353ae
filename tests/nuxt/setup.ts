// happy-dom has no IndexedDB: the device's stores keep their state there (useIDBKeyval), so the tests give them one.
import 'fake-indexeddb/auto'
