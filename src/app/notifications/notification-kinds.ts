/** Icon per notification kind (docs/api-analysis.md: review-request, comment, reply, approved, returned). */
export function notificationIcon(kind: string): string {
  switch (kind) {
    case 'review-request':
      return 'rate_review';
    case 'comment':
      return 'comment';
    case 'reply':
      return 'reply';
    case 'approved':
      return 'verified';
    case 'returned':
      return 'assignment_return';
    default:
      return 'notifications';
  }
}
