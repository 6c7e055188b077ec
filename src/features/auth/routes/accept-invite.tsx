import { useState, type FormEvent } from 'react';
import { useNavigate, useParams } from 'react-router-dom';
import { Button } from '../../../components/ui/button';
import { TextField } from '../../../components/ui/field';
import { ApiError } from '../../../lib/api-client';
import { ROLE_HOME } from '../../../../shared/roles';
import { PasswordSchema } from '../../../../shared/schemas/auth';
import { useAcceptInvite } from '../api';
import { AuthFrame } from '../components/auth-frame';

export function AcceptInviteRoute() {
  const { token = '' } = useParams();
  const accept = useAcceptInvite();
  const navigate = useNavigate();
  const [password, setPassword] = useState('');
  const [error, setError] = useState<string>();
  const submit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = PasswordSchema.safeParse(password);
    if (!parsed.success) return setError(parsed.error.issues[0].message);
    setError(undefined);
    accept.mutate({ token, password }, { onSuccess: (r) => navigate(ROLE_HOME[r.user.role], { replace: true }) });
  };
  const err = accept.error instanceof ApiError ? accept.error : null;
  return (
    <AuthFrame title="Choose your password">
      <form onSubmit={submit} noValidate className="flex flex-col gap-4">
        <TextField label="New password" type="password" autoComplete="new-password" value={password} onChange={(e) => setPassword(e.target.value)} error={error ?? err?.field('password')} hint="At least 8 characters; a phrase is best." />
        {err && !err.field('password') && <p role="alert" className="text-state-stop">{err.message}</p>}
        <Button type="submit" disabled={accept.isPending}>Save and sign in</Button>
      </form>
    </AuthFrame>
  );
}
