/* qv-welcome-page.c — before a document.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <glib/gi18n.h>
#include "qv-config.h"
#include "qv-welcome-page.h"

struct _QvWelcomePage
{
  GtkWidget parent_instance;
  GtkWidget *scroller;
  GtkWidget *recent_title;
  GtkListBox *recent_list;
  GtkRecentManager *recent;
};

G_DEFINE_FINAL_TYPE (QvWelcomePage, qv_welcome_page, GTK_TYPE_WIDGET)

static gboolean
is_ours (GtkRecentInfo *info)
{
  const char *uri = gtk_recent_info_get_uri (info);
  return gtk_recent_info_is_local (info) && gtk_recent_info_exists (info)
         && (g_str_has_suffix (uri, ".json") || g_str_has_suffix (uri, ".xyz")
             || g_str_has_suffix (uri, ".extxyz"))
         && gtk_recent_info_has_application (info, g_get_application_name ());
}

static int
by_time_desc (gconstpointer a, gconstpointer b)
{
  GDateTime *ta = gtk_recent_info_get_modified ((GtkRecentInfo *) a);
  GDateTime *tb = gtk_recent_info_get_modified ((GtkRecentInfo *) b);
  return -g_date_time_compare (ta, tb);
}

static void
update_recent (QvWelcomePage *self)
{
  GList *items = gtk_recent_manager_get_items (self->recent);
  GList *ours = NULL;
  GtkWidget *child;
  guint shown = 0;

  while ((child = gtk_widget_get_first_child (GTK_WIDGET (self->recent_list))) != NULL)
    gtk_list_box_remove (self->recent_list, child);
  for (GList *l = items; l; l = l->next)
    if (is_ours (l->data))
      ours = g_list_prepend (ours, l->data);
  ours = g_list_sort (ours, by_time_desc);
  for (GList *l = ours; l && shown < QV_WELCOME_MAX_RECENT; l = l->next, shown++)
    {
      GtkRecentInfo *info = l->data;
      g_autoptr(GFile) file = g_file_new_for_uri (gtk_recent_info_get_uri (info));
      g_autoptr(GFile) parent = g_file_get_parent (file);
      g_autofree char *dir = parent ? g_file_get_path (parent) : g_strdup ("");
      GtkWidget *button = gtk_button_new ();
      GtkWidget *box = gtk_box_new (GTK_ORIENTATION_VERTICAL, 2);
      GtkWidget *name = gtk_label_new (gtk_recent_info_get_display_name (info));
      GtkWidget *where = gtk_label_new (dir);

      gtk_label_set_xalign (GTK_LABEL (name), 0.0f);
      gtk_label_set_ellipsize (GTK_LABEL (name), PANGO_ELLIPSIZE_MIDDLE);
      gtk_label_set_xalign (GTK_LABEL (where), 0.0f);
      gtk_label_set_ellipsize (GTK_LABEL (where), PANGO_ELLIPSIZE_START);
      gtk_widget_add_css_class (where, "caption");
      gtk_widget_add_css_class (where, "dim-label");
      gtk_box_append (GTK_BOX (box), name);
      gtk_box_append (GTK_BOX (box), where);
      gtk_button_set_child (GTK_BUTTON (button), box);
      gtk_widget_add_css_class (button, "flat");
      gtk_actionable_set_action_name (GTK_ACTIONABLE (button), "win.open-recent");
      gtk_actionable_set_action_target (GTK_ACTIONABLE (button), "s", gtk_recent_info_get_uri (info));
      gtk_list_box_append (self->recent_list, button);
    }
  gtk_widget_set_visible (self->recent_title, shown > 0);
  gtk_widget_set_visible (GTK_WIDGET (self->recent_list), shown > 0);
  g_list_free (ours);
  g_list_free_full (items, (GDestroyNotify) gtk_recent_info_unref);
}

static void
qv_welcome_page_dispose (GObject *object)
{
  QvWelcomePage *self = QV_WELCOME_PAGE (object);
  if (self->recent)
    g_signal_handlers_disconnect_by_func (self->recent, update_recent, self);
  self->recent = NULL;
  gtk_widget_dispose_template (GTK_WIDGET (object), QV_TYPE_WELCOME_PAGE);
  G_OBJECT_CLASS (qv_welcome_page_parent_class)->dispose (object);
}

static void
qv_welcome_page_class_init (QvWelcomePageClass *klass)
{
  GtkWidgetClass *widget_class = GTK_WIDGET_CLASS (klass);

  G_OBJECT_CLASS (klass)->dispose = qv_welcome_page_dispose;
  gtk_widget_class_set_layout_manager_type (widget_class, GTK_TYPE_BIN_LAYOUT);
  gtk_widget_class_set_css_name (widget_class, "qvwelcomepage");
  gtk_widget_class_set_template_from_resource (widget_class, "/org/quaverlab/Quaver/gui/qv-welcome-page.ui");
  gtk_widget_class_bind_template_child (widget_class, QvWelcomePage, scroller);
  gtk_widget_class_bind_template_child (widget_class, QvWelcomePage, recent_title);
  gtk_widget_class_bind_template_child (widget_class, QvWelcomePage, recent_list);
}

static void
qv_welcome_page_init (QvWelcomePage *self)
{
  gtk_widget_init_template (GTK_WIDGET (self));
  self->recent = gtk_recent_manager_get_default ();
  g_signal_connect_swapped (self->recent, "changed", G_CALLBACK (update_recent), self);
  update_recent (self);
}
