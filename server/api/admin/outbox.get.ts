import { Notification } from '../../models'

/** E-mails Chargewell sent (or failed to send), and, with the local fake SMTP server, what it received. */
export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin')
  const notifications = await Notification.findAll({ order: [['id', 'DESC']], limit: 200 })
  return {
    fakeSmtp: useRuntimeConfig().fakeSmtp === 'fake',
    notifications: notifications.map(notification => notification.get({ plain: true })),
    received: fakeInbox(),
  }
})
