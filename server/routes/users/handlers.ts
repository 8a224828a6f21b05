import type { Request, Response } from 'express';
import { Op, type Order, type WhereOptions } from 'sequelize';
import { badgeCode } from '../../../shared/domain/codes';
import { ROLE_LABELS } from '../../../shared/permissions';
import { IdParamsSchema, InviteUserSchema, UpdateUserSchema, UserListQuerySchema, type Page, type UserView } from '../../../shared/schemas/users';
import { AppError, conflict, notFound } from '../../errors';
import { currentUser } from '../../middleware/auth';
import { parsed } from '../../middleware/validate';
import { issueLink, LINK_TTL_HOURS, publicBase } from '../../auth/links';
import { invitationMail } from '../../mail/messages';
import { presentUser } from '../../presenters/user';
import type { User } from '../../models/user';

const SORT_COLUMNS = { name: 'name', email: 'email', role: 'role', createdAt: 'createdAt' } as const;

async function loadUser(req: Request): Promise<User> {
  const { id } = parsed(req, IdParamsSchema, 'params');
  const user = await req.ctx.models.User.findByPk(id);
  if (!user) throw notFound(`No user has id ${id}.`);
  return user;
}

async function sendInvitation(req: Request, user: User, token: string): Promise<void> {
  const me = currentUser(req);
  try {
    await req.ctx.mailer.send(
      invitationMail({
        to: user.email,
        name: user.name,
        invitedBy: me.name,
        roleLabel: ROLE_LABELS[user.role],
        link: `${publicBase(req)}/set-password?token=${token}`,
        hours: LINK_TTL_HOURS,
      }),
    );
  } catch {
    throw new AppError(502, 'mail_failed', `${user.email} is on the list, but the invitation could not be sent. Check the mail settings, then send it again from their page.`, {
      userId: user.id,
    });
  }
}

/** GET /api/users: a page of people, searched by name, e-mail or badge, sorted and filtered. */
export async function listUsers(req: Request, res: Response): Promise<void> {
  const query = parsed(req, UserListQuerySchema, 'query');
  const where: WhereOptions[] = [];
  if (query.q) {
    const like = `%${query.q.replace(/[\\%_]/g, '\\$&')}%`;
    where.push({ [Op.or]: [{ name: { [Op.iLike]: like } }, { email: { [Op.iLike]: like } }, { badgeCode: { [Op.iLike]: like } }] });
  }
  if (query.role) where.push({ role: query.role });
  if (query.active) where.push({ active: query.active === 'true' });
  const desc = query.sort.startsWith('-');
  const column = SORT_COLUMNS[query.sort.replace(/^-/, '') as keyof typeof SORT_COLUMNS];
  const order: Order = [[column, desc ? 'DESC' : 'ASC'], ['id', 'ASC']];
  const { rows, count } = await req.ctx.models.User.findAndCountAll({
    where: { [Op.and]: where },
    order,
    limit: query.pageSize,
    offset: (query.page - 1) * query.pageSize,
  });
  const page: Page<UserView> = { items: rows.map(presentUser), total: count, page: query.page, pageSize: query.pageSize };
  res.json(page);
}

/** POST /api/users: adds a person with a badge code and e-mails them a link to choose a password. */
export async function inviteUser(req: Request, res: Response): Promise<void> {
  const body = parsed(req, InviteUserSchema);
  const { User } = req.ctx.models;
  if (await User.findOne({ where: { email: { [Op.iLike]: body.email.replace(/[\\%_]/g, '\\$&') } } })) {
    throw conflict('duplicate', `Someone already uses ${body.email}.`, [{ path: 'email', message: 'This address is already on the list.' }]);
  }
  const { user, token } = await req.ctx.sequelize.transaction(async (transaction) => {
    let created: User | null = null;
    // Badge bodies are random; on the rare collision, draw again.
    for (let attempt = 0; !created && attempt < 5; attempt++) {
      const code = badgeCode();
      if (await User.findOne({ where: { badgeCode: code }, transaction })) continue;
      created = await User.create(
        { ...body, badgeCode: code, passwordHash: null, pinHash: null, lockedUntil: null },
        { transaction },
      );
    }
    if (!created) throw new AppError(500, 'internal', 'No free badge code was found; try again.');
    return { user: created, token: await issueLink(req.ctx, created.id, 'invite', transaction) };
  });
  await sendInvitation(req, user, token);
  res.status(201).json(presentUser(user));
}

/** GET /api/users/:id */
export async function getUser(req: Request, res: Response): Promise<void> {
  res.json(presentUser(await loadUser(req)));
}

/**
 * PATCH /api/users/:id: name, role, active. A manager may not demote or deactivate themself
 * (so a lab never loses its last manager by accident); deactivating ends the person's sessions.
 */
export async function updateUser(req: Request, res: Response): Promise<void> {
  const body = parsed(req, UpdateUserSchema);
  const user = await loadUser(req);
  const me = currentUser(req);
  if (user.id === me.id && ((body.role && body.role !== user.role) || body.active === false)) {
    throw conflict('self_change', 'You cannot change your own role or deactivate yourself; ask another lab manager.');
  }
  const endSessions = body.active === false && user.active;
  await user.update({ ...body, ...(endSessions ? { sessionVersion: user.sessionVersion + 1 } : {}) });
  res.json(presentUser(user));
}

/** POST /api/users/:id/unlock: lifts a lockout after wrong passwords. */
export async function unlockUser(req: Request, res: Response): Promise<void> {
  const user = await loadUser(req);
  await user.update({ failedLogins: 0, lockedUntil: null });
  res.json(presentUser(user));
}

/** POST /api/users/:id/invite: sends a new invitation to someone who has not chosen a password yet. */
export async function resendInvite(req: Request, res: Response): Promise<void> {
  const user = await loadUser(req);
  if (user.passwordHash) throw conflict('already_joined', `${user.name} has already chosen a password; they can reset it from the sign-in screen.`);
  if (!user.active) throw conflict('inactive', `${user.name} is deactivated; reactivate them first.`);
  const token = await issueLink(req.ctx, user.id, 'invite');
  await sendInvitation(req, user, token);
  res.status(202).json(presentUser(user));
}
