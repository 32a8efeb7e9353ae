import { seedDemo } from '../../services/demo-seed'

/** `npm run seed`: migrates the configured database and fills it with the invented demo scenario (idempotent). */
export default defineTask({
  meta: { name: 'db:seed', description: 'Migrate the database and load the demo scenario' },
  async run() {
    return { result: await seedDemo() }
  },
})
