/* qv-mode-list.c — the mode list's model, items made on demand.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "qv-mode-item.h"
#include "qv-mode-list.h"

struct _QvModeList
{
  GObject parent_instance;
  QvDocument *document;
  const QvModeRow *rows;       /* the document's */
  guint n_items;
  guint level;
  GPtrArray *items;            /* QvModeItem or NULL, n_items */
  guint n_made;
};

static void qv_mode_list_model_init (GListModelInterface *iface);

static void
clear_item (gpointer data)
{
  if (data)
    g_object_unref (data);
}

G_DEFINE_FINAL_TYPE_WITH_CODE (QvModeList, qv_mode_list, G_TYPE_OBJECT,
                               G_IMPLEMENT_INTERFACE (G_TYPE_LIST_MODEL, qv_mode_list_model_init))

static GType
qv_mode_list_get_item_type (GListModel *model)
{
  return QV_TYPE_MODE_ITEM;
}

static guint
qv_mode_list_get_n_items (GListModel *model)
{
  return QV_MODE_LIST (model)->n_items;
}

static gpointer
qv_mode_list_get_item (GListModel *model, guint position)
{
  QvModeList *self = QV_MODE_LIST (model);
  QvModeItem *item;

  if (position >= self->n_items)
    return NULL;
  item = g_ptr_array_index (self->items, position);
  if (item == NULL)
    {
      item = qv_mode_item_new (&self->rows[position], position, self->level);
      self->items->pdata[position] = item;
      self->n_made++;
    }
  return g_object_ref (item);
}

static void
qv_mode_list_model_init (GListModelInterface *iface)
{
  iface->get_item_type = qv_mode_list_get_item_type;
  iface->get_n_items = qv_mode_list_get_n_items;
  iface->get_item = qv_mode_list_get_item;
}

static void
qv_mode_list_finalize (GObject *object)
{
  QvModeList *self = QV_MODE_LIST (object);

  g_ptr_array_unref (self->items);
  g_clear_object (&self->document);
  G_OBJECT_CLASS (qv_mode_list_parent_class)->finalize (object);
}

static void
qv_mode_list_class_init (QvModeListClass *klass)
{
  G_OBJECT_CLASS (klass)->finalize = qv_mode_list_finalize;
}

static void
qv_mode_list_init (QvModeList *self)
{
  self->items = g_ptr_array_new_full (0, clear_item);
}

QvModeList *
qv_mode_list_new (void)
{
  return g_object_new (QV_TYPE_MODE_LIST, NULL);
}

void
qv_mode_list_set_document (QvModeList *self, QvDocument *doc, guint level)
{
  const guint removed = self->n_items;

  g_clear_pointer (&self->items, g_ptr_array_unref);
  g_set_object (&self->document, doc);
  self->rows = doc ? qv_document_get_rows (doc) : NULL;
  self->n_items = doc ? (guint) qv_document_get_modes (doc)->n_modes : 0;
  self->level = level;
  self->n_made = 0;
  self->items = g_ptr_array_new_full (self->n_items, clear_item);
  g_ptr_array_set_size (self->items, self->n_items);
  g_list_model_items_changed (G_LIST_MODEL (self), 0, removed, self->n_items);
}

void
qv_mode_list_set_level (QvModeList *self, guint v)
{
  self->level = v;
  for (guint i = 0; i < self->items->len; i++)
    if (self->items->pdata[i])
      qv_mode_item_set_level (self->items->pdata[i], v);
}

void
qv_mode_list_notify_all (QvModeList *self, const char *property)
{
  for (guint i = 0; i < self->items->len; i++)
    if (self->items->pdata[i])
      g_object_notify (self->items->pdata[i], property);
}

guint
qv_mode_list_get_n_made (QvModeList *self)
{
  return self->n_made;
}
